import { useNavigate, type LoaderFunctionArgs } from 'react-router-dom';
import { PageHeader } from '@/components/ui/page';
import { useCreateCustomer } from '@/features/customers/api/create-customer';
import { CustomerForm } from '@/features/customers/components/customer-form';
import { EDITORS, requireSession } from '../../guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, EDITORS);
  return null;
}

export function Component() {
  const navigate = useNavigate();
  const create = useCreateCustomer();
  return (
    <>
      <PageHeader title="Add owner" lead="A private owner or a flying group." back={{ to: '/owners', label: 'Owners' }} />
      <CustomerForm
        submitLabel="Add owner"
        cancelTo="/owners"
        onSubmit={async (v) => {
          const c = await create.mutateAsync(v);
          await navigate(`/owners/${c.id}`);
        }}
      />
    </>
  );
}
