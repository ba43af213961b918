import { useSuspenseQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useNavigate, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { changedFields, TheirChangesNotice } from '@/components/ui/their-changes';
import { PageHeader } from '@/components/ui/page';
import { customerQueryOptions } from '@/features/customers/api/get-customer';
import { customerKeys } from '@/features/customers/api/keys';
import { useUpdateCustomer } from '@/features/customers/api/update-customer';
import { CUSTOMER_LABELS, CustomerForm } from '@/features/customers/components/customer-form';
import { CUSTOMER_KIND_LABELS, type CustomerDto } from '@wingstage/shared';
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
  // What the form was filled from; a refused save compares it with what is saved now.
  const [started, setStarted] = useState<CustomerDto>(c);
  const [stale, setStale] = useState(false);
  const [formKey, setFormKey] = useState(0);
  return (
    <>
      <PageHeader title={`Edit ${c.name}`} back={{ to: `/owners/${id}`, label: c.name }} />
      {stale && c.version !== started.version ? (
        <div className="mb-4 max-w-2xl">
          <TheirChangesNotice
            what="owner"
            changes={changedFields<CustomerDto>(started, c, CUSTOMER_LABELS, (f, v) => (f === 'kind' ? CUSTOMER_KIND_LABELS[v as CustomerDto['kind']] : String(v)))}
            onTakeTheirs={() => {
              setStarted(c);
              setStale(false);
              setFormKey((k) => k + 1);
            }}
          />
        </div>
      ) : null}
      <CustomerForm
        key={formKey}
        initial={c}
        submitLabel="Save changes"
        cancelTo={`/owners/${id}`}
        onSubmit={async (v) => {
          try {
            // After a refused save, c is their version: saving again goes over it on purpose.
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
