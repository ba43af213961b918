import type { LoaderFunctionArgs } from 'react-router-dom';
import { DepositAccountsPage } from '@/features/payments/components/deposit-lists';
import { OFFICE, requireSession } from '../../guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, OFFICE);
  return null;
}

export function Component() {
  return <DepositAccountsPage />;
}
