import { JOB_TYPE_LABELS } from '@wingstage/shared';
import { useSuspenseQuery } from '@tanstack/react-query';
import { Link, type LoaderFunctionArgs } from 'react-router-dom';
import { ButtonLink } from '@/components/ui/button-link';
import { Notice } from '@/components/ui/notice';
import { PageHeader } from '@/components/ui/page';
import { templatesQueryOptions } from '@/features/templates/api/get-templates';
import { EXAMPLE_LIMITS_CAUTION } from '@/features/templates/components/template-editor';
import { can } from '@/lib/permissions';
import { queryClient } from '@/lib/query-client';
import { requireSession, STAFF } from '../../guards';
import { useCurrentSession } from '../../use-current-session';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, STAFF);
  await queryClient.ensureQueryData(templatesQueryOptions());
  return null;
}

export function Component() {
  const session = useCurrentSession();
  const { data: templates } = useSuspenseQuery(templatesQueryOptions());
  return (
    <>
      <PageHeader
        title="Templates"
        lead="Kinds of job with their inspection scope and checklist. Booking in from a template copies both onto the job."
        actions={can.editTemplates(session.user.role) ? <ButtonLink to="/templates/new">New template</ButtonLink> : null}
      />
      <div className="mb-4">
        <Notice title="Example limits">
          <p>{EXAMPLE_LIMITS_CAUTION}</p>
        </Notice>
      </div>
      {templates.length === 0 ? <p className="text-slate-soft">No templates yet.</p> : null}
      <ul className="grid gap-3 md:grid-cols-2">
        {templates.map((t) => (
          <li key={t.id} className="flex flex-col gap-1 rounded-card border border-seam bg-cloth-raised p-4">
            <Link to={`/templates/${t.id}`} className="text-lg font-semibold">
              {t.name}
            </Link>
            <span className="text-sm text-slate-soft">{JOB_TYPE_LABELS[t.jobType]}</span>
            <span className="text-sm tabular-nums">
              {t.lineCount} scope {t.lineCount === 1 ? 'line' : 'lines'} · {t.checklistCount} checklist {t.checklistCount === 1 ? 'item' : 'items'}
            </span>
            {!t.active ? <span className="self-start rounded-full border border-dashed border-slate-soft px-2 text-xs">not offered when booking in</span> : null}
          </li>
        ))}
      </ul>
    </>
  );
}
