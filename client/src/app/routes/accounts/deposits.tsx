import type { LoaderFunctionArgs } from 'react-router-dom';
import { DepositAccountsPage } from '@/features/payments/components/deposit-lists';
import { AccountsNav } from '@/features/accounts/components/accounts-nav';
import { OFFICE, requireSession } from '../../guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, OFFICE);
  return null;
}

export function Component() {
  return <DepositAccountsPage nav={<AccountsNav />} />;
}
