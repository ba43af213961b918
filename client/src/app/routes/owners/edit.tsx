import { useSuspenseQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useNavigate, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { Notice } from '@/components/ui/notice';
import { PageHeader } from '@/components/ui/page';
import { customerQueryOptions } from '@/features/customers/api/get-customer';
import { customerKeys } from '@/features/customers/api/keys';
import { useUpdateCustomer } from '@/features/customers/api/update-customer';
import { CustomerForm } from '@/features/customers/components/customer-form';
import { isApiError } from '@/lib/api-client';
import { queryClient } from '@/lib/query-client';
import { EDITORS, requireSession } from '../../guards';

export async function loader({ request, params }: LoaderFunctionArgs) {
  await requireSession(request, EDITORS);
  await queryClient.ensureQueryData(customerQueryOptions(params.id!));
  return null;
}

export function Component() {
  const { id } = useParams() as { id: string };
  const navigate = useNavigate();
  const { data: c } = useSuspenseQuery(customerQueryOptions(id));
  const update = useUpdateCustomer(id);
  const [stale, setStale] = useState(false);
  return (
    <>
      <PageHeader title={`Edit ${c.name}`} back={{ to: `/owners/${id}`, label: c.name }} />
      {stale ? (
        <div className="mb-4 max-w-2xl">
          <Notice tone="problem" title="Not saved">Someone else changed this owner while you were editing. The form now shows their version; make your change again.</Notice>
        </div>
      ) : null}
      <CustomerForm
        key={c.version}
        initial={c}
        submitLabel="Save changes"
        cancelTo={`/owners/${id}`}
        onSubmit={async (v) => {
          try {
            await update.mutateAsync({ ...v, version: c.version });
            await navigate(`/owners/${id}`);
          } catch (e) {
            if (isApiError(e) && e.code === 'stale_version') {
              setStale(true);
              await queryClient.invalidateQueries({ queryKey: customerKeys.detail(id) });
              return;
            }
            throw e;
          }
        }}
      />
    </>
  );
}
