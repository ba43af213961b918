import { useParams } from 'react-router-dom';
import { DecideScreen } from '@/features/decide/components/decide-screen';

/**
 * In the built app the server answers /decide/* with decide.html, the page's own light entry; this
 * route only serves a client-side visit from inside the main app.
 */
export function Component() {
  const { token } = useParams() as { token: string };
  return <DecideScreen token={token} />;
}
