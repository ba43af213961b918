import { useSuspenseQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useNavigate, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { Notice } from '@/components/ui/notice';
import { PageHeader } from '@/components/ui/page';
import { aircraftQueryOptions } from '@/features/aircraft/api/get-aircraft';
import { useUpdateAircraft } from '@/features/aircraft/api/update-aircraft';
import { AircraftForm } from '@/features/aircraft/components/aircraft-form';
import { aircraftKeys } from '@/features/aircraft/api/keys';
import { ALL_OWNERS, customersQueryOptions } from '@/features/customers/api/get-customers';
import { isApiError } from '@/lib/api-client';
import { queryClient } from '@/lib/query-client';
import { EDITORS, requireSession } from '../../guards';

export async function loader({ request, params }: LoaderFunctionArgs) {
  await requireSession(request, EDITORS);
  await Promise.all([queryClient.ensureQueryData(aircraftQueryOptions(params.id!)), queryClient.ensureQueryData(customersQueryOptions(ALL_OWNERS))]);
  return null;
}

export function Component() {
  const { id } = useParams() as { id: string };
  const navigate = useNavigate();
  const { data: aircraft } = useSuspenseQuery(aircraftQueryOptions(id));
  const { data: owners } = useSuspenseQuery(customersQueryOptions(ALL_OWNERS));
  const update = useUpdateAircraft(id);
  const [stale, setStale] = useState(false);
  return (
    <>
      <PageHeader title={`Edit ${aircraft.registration}`} back={{ to: `/aircraft/${id}`, label: aircraft.registration }} />
      {stale ? (
        <div className="mb-4 max-w-2xl">
          <Notice tone="problem" title="Not saved">Someone else changed this aircraft while you were editing. The form now shows their version; make your change again.</Notice>
        </div>
      ) : null}
      <AircraftForm
        key={aircraft.version}
        initial={aircraft}
        owners={owners.items}
        submitLabel="Save changes"
        cancelTo={`/aircraft/${id}`}
        onSubmit={async (v) => {
          try {
            await update.mutateAsync({ ...v, version: aircraft.version });
            await navigate(`/aircraft/${id}`);
          } catch (e) {
            if (isApiError(e) && e.code === 'stale_version') {
              setStale(true);
              await queryClient.invalidateQueries({ queryKey: aircraftKeys.detail(id) });
              return;
            }
            throw e;
          }
        }}
      />
    </>
  );
}
