import { useQuery, useQueryClient, useSuspenseQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useNavigate, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { Notice } from '@/components/ui/notice';
import { PageHeader } from '@/components/ui/page';
import { templateKeys } from '@/features/templates/api/keys';
import { templateQueryOptions } from '@/features/templates/api/get-templates';
import { useSaveTemplate } from '@/features/templates/api/save-template';
import { TemplateEditor } from '@/features/templates/components/template-editor';
import { workshopQueryOptions } from '@/features/workshop/api/get-workshop';
import { queryClient } from '@/lib/query-client';
import { EDITORS, requireSession, STAFF } from '../../guards';
import { can } from '@/lib/permissions';
import { useCurrentSession } from '../../use-current-session';

export async function loader({ request, params }: LoaderFunctionArgs) {
  await requireSession(request, params.id ? STAFF : EDITORS);
  await Promise.all([
    queryClient.ensureQueryData(workshopQueryOptions()),
    params.id ? queryClient.ensureQueryData(templateQueryOptions(params.id)) : null,
  ]);
  return null;
}

export function Component() {
  const { id } = useParams();
  const session = useCurrentSession();
  const navigate = useNavigate();
  const qc = useQueryClient();
  const { data: workshop } = useSuspenseQuery(workshopQueryOptions());
  const template = useQuery({ ...templateQueryOptions(id ?? ''), enabled: Boolean(id) });
  const save = useSaveTemplate();
  const [saved, setSaved] = useState(false);
  const t = id ? (template.data ?? null) : null;
  const editor = can.editTemplates(session.user.role);

  return (
    <>
      <PageHeader back={{ to: '/templates', label: 'Templates' }} title={t ? t.name : 'New template'} lead={t ? `Version ${t.version}` : 'A kind of job with its scope and checklist.'} />
      {saved ? (
        <div className="mb-4">
          <Notice title="Saved">Jobs booked in from now on use this version.</Notice>
        </div>
      ) : null}
      {!editor ? (
        <div className="mb-4">
          <Notice>Only a manager or an admin can change templates; you can read this one.</Notice>
        </div>
      ) : null}
      <fieldset disabled={!editor} className="min-w-0">
        <TemplateEditor
          key={t ? `${t.id}:${t.version}` : 'new'}
          template={t}
          workshop={workshop}
          onReload={() => void qc.invalidateQueries({ queryKey: templateKeys.detail(id ?? '') })}
          onSave={async (v) => {
            setSaved(false);
            const result = t ? await save.mutateAsync({ id: t.id, body: { ...v, version: t.version } }) : await save.mutateAsync({ id: null, body: v });
            setSaved(true);
            if (!t) await navigate(`/templates/${result.id}`, { replace: true });
          }}
        />
      </fieldset>
    </>
  );
}
