import { keepPreviousData, useQuery, useSuspenseQuery } from '@tanstack/react-query';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { ButtonLink } from '@/components/ui/button-link';
import { Caution, Loading } from '@/components/ui/notice';
import { Card, Facts, PageHeader } from '@/components/ui/page';
import { aircraftQueryOptions } from '@/features/aircraft/api/get-aircraft';
import { jobsQueryOptions } from '@/features/jobs/api/get-jobs';
import { JobsTable } from '@/features/jobs/components/jobs-table';
import { formatHours } from '@/lib/format';
import { useListParams } from '@/lib/list-params';
import { can } from '@/lib/permissions';
import { queryClient } from '@/lib/query-client';
import { OFFICE, requireSession } from '../../guards';
import { useCurrentSession } from '../../use-current-session';

export async function loader({ request, params }: LoaderFunctionArgs) {
  await requireSession(request, OFFICE);
  await queryClient.ensureQueryData(aircraftQueryOptions(params.id!));
  return null;
}

export function Component() {
  const { id } = useParams() as { id: string };
  const session = useCurrentSession();
  const { data: a } = useSuspenseQuery(aircraftQueryOptions(id));
  const [params, update] = useListParams({ sort: 'bookedInOn', dir: 'desc', pageSize: 10 });
  const jobs = useQuery({
    ...jobsQueryOptions({ aircraftId: id, sort: params.sort, dir: params.dir, page: params.page, pageSize: params.pageSize }),
    placeholderData: keepPreviousData,
  });
  const editor = can.editRecords(session.user.role);
  return (
    <>
      <PageHeader
        back={{ to: '/aircraft', label: 'Aircraft' }}
        title={<span className="tracking-wide">{a.registration}</span>}
        lead={a.type}
        actions={
          editor ? (
            <>
              <ButtonLink to={`/jobs/new?aircraftId=${a.id}`}>Book in</ButtonLink>
              <ButtonLink to={`/aircraft/${a.id}/edit`} variant="secondary">
                Edit aircraft
              </ButtonLink>
            </>
          ) : null
        }
      />
      <div className="flex flex-col gap-5">
        <Card title="Aircraft">
          <Facts
            items={[
              { label: 'Owner', value: <Link to={`/owners/${a.customerId}`}>{a.customerName}</Link> },
              { label: 'Serial number', value: a.serial },
              { label: 'Airframe hours', value: formatHours(a.airframeHours) },
              { label: 'Engine', value: a.engine },
              { label: 'Engine hours', value: formatHours(a.engineHours) },
              { label: 'Notes', value: a.notes ? <span className="whitespace-pre-line">{a.notes}</span> : '' },
            ]}
          />
        </Card>
        <Card title="Jobs">{jobs.data ? <JobsTable page={jobs.data} params={params} onChange={update} busy={jobs.isPlaceholderData} /> : <Loading />}</Card>
      </div>
      <Caution />
    </>
  );
}
