import { useSuspenseQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useNavigate, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { changedFields, TheirChangesNotice } from '@/components/ui/their-changes';
import type { AircraftDto } from '@wingstage/shared';
import { PageHeader } from '@/components/ui/page';
import { aircraftQueryOptions } from '@/features/aircraft/api/get-aircraft';
import { useUpdateAircraft } from '@/features/aircraft/api/update-aircraft';
import { AIRCRAFT_LABELS, AircraftForm } from '@/features/aircraft/components/aircraft-form';
import { aircraftKeys } from '@/features/aircraft/api/keys';
import { customerQueryOptions } from '@/features/customers/api/get-customer';
import { isApiError } from '@/lib/api-client';
import { queryClient } from '@/lib/query-client';
import { EDITORS, requireSession } from '../../guards';
import { ownerPickerSource } from './owner-picker';

export async function loader({ request, params }: LoaderFunctionArgs) {
  await requireSession(request, EDITORS);
  const aircraft = await queryClient.ensureQueryData(aircraftQueryOptions(params.id!));
  // The owner picker shows this name at once instead of looking it up after the page opens.
  await queryClient.ensureQueryData(customerQueryOptions(aircraft.customerId)).catch(() => null);
  return null;
}

export function Component() {
  const { id } = useParams() as { id: string };
  const navigate = useNavigate();
  const { data: aircraft } = useSuspenseQuery(aircraftQueryOptions(id));
  const update = useUpdateAircraft(id);
  // What the form was filled from; a refused save compares it with what is saved now.
  const [started, setStarted] = useState<AircraftDto>(aircraft);
  const [stale, setStale] = useState(false);
  const [formKey, setFormKey] = useState(0);
  return (
    <>
      <PageHeader title={`Edit ${aircraft.registration}`} back={{ to: `/aircraft/${id}`, label: aircraft.registration }} />
      {stale && aircraft.version !== started.version ? (
        <div className="mb-4 max-w-2xl">
          <TheirChangesNotice
            what="aircraft"
            changes={changedFields<AircraftDto>(started, aircraft, AIRCRAFT_LABELS, (f, v) => (f === 'customerId' ? aircraft.customerName : String(v)))}
            onTakeTheirs={() => {
              setStarted(aircraft);
              setStale(false);
              setFormKey((k) => k + 1);
            }}
          />
        </div>
      ) : null}
      <AircraftForm
        key={formKey}
        initial={aircraft}
        owners={ownerPickerSource}
        submitLabel="Save changes"
        cancelTo={`/aircraft/${id}`}
        onSubmit={async (v) => {
          try {
            // After a refused save, this is their version: saving again goes over it on purpose.
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
