import { useQuery, useSuspenseQuery } from '@tanstack/react-query';
import { useNavigate, useSearchParams, type LoaderFunctionArgs } from 'react-router-dom';
import { ButtonLink } from '@/components/ui/button-link';
import { Notice } from '@/components/ui/notice';
import { PageHeader } from '@/components/ui/page';
import { aircraftPickerSource } from '@/features/aircraft/api/aircraft-picker';
import { aircraftQueryOptions } from '@/features/aircraft/api/get-aircraft';
import { aircraftListQueryOptions } from '@/features/aircraft/api/get-aircraft-list';
import { templatesQueryOptions } from '@/features/templates/api/get-templates';
import { useCreateJob } from '@/features/jobs/api/create-job';
import { BookInForm } from '@/features/jobs/components/job-form';
import { queryClient } from '@/lib/query-client';
import { EDITORS, requireSession } from '../../guards';

// One row is enough to know whether there is any aircraft to book in; the picker searches the rest.
const ANY_AIRCRAFT = { pageSize: 1, sort: 'registration', dir: 'asc' as const };

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, EDITORS);
  const aircraftId = new URL(request.url).searchParams.get('aircraftId');
  await Promise.all([
    queryClient.ensureQueryData(aircraftListQueryOptions(ANY_AIRCRAFT)),
    // Primes the picker's label for a booking started from an aircraft's page; an unknown id just leaves it empty.
    aircraftId ? queryClient.ensureQueryData(aircraftQueryOptions(aircraftId)).catch(() => null) : null,
  ]);
  return null;
}

export function Component() {
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const { data: aircraft } = useSuspenseQuery(aircraftListQueryOptions(ANY_AIRCRAFT));
  const create = useCreateJob();
  // Booking in still works if templates cannot be loaded: the picker is simply not offered.
  const templates = useQuery(templatesQueryOptions());
  const back = search.get('aircraftId') ? `/aircraft/${search.get('aircraftId')}` : '/jobs';
  return (
    <>
      <PageHeader title="Book in" lead="Open a job for one visit of one aircraft." back={{ to: back, label: 'Back' }} />
      {aircraft.total === 0 ? (
        <Notice title="No aircraft yet">
          <p>Add the aircraft first, then book it in.</p>
          <div className="mt-2">
            <ButtonLink to="/aircraft/new">Add aircraft</ButtonLink>
          </div>
        </Notice>
      ) : (
        <BookInForm
          aircraft={aircraftPickerSource}
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
