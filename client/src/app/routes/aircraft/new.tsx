import { useSuspenseQuery } from '@tanstack/react-query';
import { useNavigate, useSearchParams, type LoaderFunctionArgs } from 'react-router-dom';
import { PageHeader } from '@/components/ui/page';
import { useCreateAircraft } from '@/features/aircraft/api/create-aircraft';
import { AircraftForm } from '@/features/aircraft/components/aircraft-form';
import { ALL_OWNERS, customersQueryOptions } from '@/features/customers/api/get-customers';
import { queryClient } from '@/lib/query-client';
import { EDITORS, requireSession } from '../../guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, EDITORS);
  await queryClient.ensureQueryData(customersQueryOptions(ALL_OWNERS));
  return null;
}

export function Component() {
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const { data: owners } = useSuspenseQuery(customersQueryOptions(ALL_OWNERS));
  const create = useCreateAircraft();
  const ownerId = search.get('customerId') ?? undefined;
  const back = ownerId ? `/owners/${ownerId}` : '/aircraft';
  return (
    <>
      <PageHeader title="Add aircraft" back={{ to: back, label: 'Back' }} />
      <AircraftForm
        owners={owners.items}
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
