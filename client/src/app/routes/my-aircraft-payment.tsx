import { Link, useSearchParams, type LoaderFunctionArgs } from 'react-router-dom';
import { Notice } from '@/components/ui/notice';
import { PaymentReturn } from '@/features/payments/components/payment-return';
import { requireSession } from '../guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, ['owner']);
  return null;
}

/** Back from the card payment page: the server is asked what happened before anything is shown. */
export function Component() {
  const [params] = useSearchParams();
  const jobId = params.get('job') ?? '';
  const sessionId = params.get('session') ?? '';
  return (
    <div className="mx-auto flex max-w-2xl flex-col gap-4">
      <h1 tabIndex={-1} className="text-2xl font-bold focus:outline-none">
        Your payment
      </h1>
      {/^[0-9a-f-]{36}$/.test(jobId) && /^cs_[A-Za-z0-9_]+$/.test(sessionId) ? (
        <PaymentReturn jobId={jobId} sessionId={sessionId} />
      ) : (
        <Notice tone="problem" title="This address is not complete">
          Go back to <Link to="/my-aircraft">your aircraft</Link> to see your payments.
        </Notice>
      )}
    </div>
  );
}
