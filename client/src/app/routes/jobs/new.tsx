import { useQuery, useSuspenseQuery } from '@tanstack/react-query';
import { useNavigate, useSearchParams, type LoaderFunctionArgs } from 'react-router-dom';
import { ButtonLink } from '@/components/ui/button';
import { Notice } from '@/components/ui/notice';
import { PageHeader } from '@/components/ui/page';
import { aircraftListQueryOptions } from '@/features/aircraft/api/get-aircraft-list';
import { templatesQueryOptions } from '@/features/templates/api/get-templates';
import { useCreateJob } from '@/features/jobs/api/create-job';
import { BookInForm } from '@/features/jobs/components/job-form';
import { queryClient } from '@/lib/query-client';
import { EDITORS, requireSession } from '../../guards';

// The list endpoint's page-size ceiling; a small workshop's whole fleet fits in one page.
const ALL_AIRCRAFT = { pageSize: 100, sort: 'registration', dir: 'asc' as const };

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, EDITORS);
  await queryClient.ensureQueryData(aircraftListQueryOptions(ALL_AIRCRAFT));
  return null;
}

export function Component() {
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const { data: aircraft } = useSuspenseQuery(aircraftListQueryOptions(ALL_AIRCRAFT));
  const create = useCreateJob();
  // Booking in still works if templates cannot be loaded: the picker is simply not offered.
  const templates = useQuery(templatesQueryOptions());
  const back = search.get('aircraftId') ? `/aircraft/${search.get('aircraftId')}` : '/jobs';
  return (
    <>
      <PageHeader title="Book in" lead="Open a job for one visit of one aircraft." back={{ to: back, label: 'Back' }} />
      {aircraft.items.length === 0 ? (
        <Notice title="No aircraft yet">
          <p>Add the aircraft first, then book it in.</p>
          <div className="mt-2">
            <ButtonLink to="/aircraft/new">Add aircraft</ButtonLink>
          </div>
        </Notice>
      ) : (
        <BookInForm
          aircraft={aircraft.items}
          defaultAircraftId={search.get('aircraftId') ?? undefined}
          cancelTo={back}
          templates={(templates.data ?? []).filter((t) => t.active)}
          onSubmit={async (v) => {
            const job = await create.mutateAsync(v);
            await navigate(`/jobs/${job.id}`);
          }}
        />
      )}
    </>
  );
}
