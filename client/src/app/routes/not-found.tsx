import { Link } from 'react-router-dom';
import { Wordmark } from '@/components/ui/wordmark';

export function NotFound({ what = 'page', mark = false }: { what?: string; mark?: boolean }) {
  return (
    <div className="mx-auto flex max-w-lg flex-col gap-3 py-12">
      {mark ? <Wordmark /> : null}
      <h1 tabIndex={-1} className="text-2xl font-bold focus:outline-none">We could not find that {what}</h1>
      <p>
        The address may be mistyped, or the {what} may belong to someone else or no longer exist.
      </p>
      <p>
        <Link to="/">Go to your start page</Link>
      </p>
    </div>
  );
}

export function Component() {
  return (
    <main id="main" className="px-gutter">
      <NotFound mark />
    </main>
  );
}
