import { useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { PayoutDetailPage } from '@/features/accounts/components/payouts-page';
import { OFFICE, requireSession } from '../../guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, OFFICE);
  return null;
}

export function Component() {
  const { id } = useParams();
  return <PayoutDetailPage id={id ?? ''} />;
}
