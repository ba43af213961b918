import { useNavigate, useSearchParams, type LoaderFunctionArgs } from 'react-router-dom';
import { PageHeader } from '@/components/ui/page';
import { useCreateAircraft } from '@/features/aircraft/api/create-aircraft';
import { AircraftForm } from '@/features/aircraft/components/aircraft-form';
import { customerQueryOptions } from '@/features/customers/api/get-customer';
import { queryClient } from '@/lib/query-client';
import { EDITORS, requireSession } from '../../guards';
import { ownerPickerSource } from './owner-picker';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, EDITORS);
  // Primes the owner's name for an aircraft added from an owner's page; an unknown id leaves the picker empty.
  const ownerId = new URL(request.url).searchParams.get('customerId');
  if (ownerId) await queryClient.ensureQueryData(customerQueryOptions(ownerId)).catch(() => null);
  return null;
}

export function Component() {
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const create = useCreateAircraft();
  const ownerId = search.get('customerId') ?? undefined;
  const back = ownerId ? `/owners/${ownerId}` : '/aircraft';
  return (
    <>
      <PageHeader title="Add aircraft" back={{ to: back, label: 'Back' }} />
      <AircraftForm
        owners={ownerPickerSource}
        defaultOwnerId={ownerId}
        submitLabel="Add aircraft"
        cancelTo={back}
        onSubmit={async (v) => {
          const a = await create.mutateAsync(v);
          await navigate(`/aircraft/${a.id}`);
        }}
      />
    </>
  );
}
