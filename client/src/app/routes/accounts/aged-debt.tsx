import { AgedDebtPage } from '@/features/accounts/components/aged-debt-page';
import { OFFICE, requireSession } from '../../guards';
import type { LoaderFunctionArgs } from 'react-router-dom';

/** Accounts and admin work here; managers may read. */
export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, OFFICE);
  return null;
}

export function Component() {
  return <AgedDebtPage />;
}
