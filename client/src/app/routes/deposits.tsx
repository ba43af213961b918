import type { LoaderFunctionArgs } from 'react-router-dom';
import { WaitingDepositsPage } from '@/features/payments/components/deposit-lists';
import { STAFF, requireSession } from '../guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, STAFF);
  return null;
}

export function Component() {
  return <WaitingDepositsPage />;
}
