import { useEffect } from 'react';
import { useBlocker } from 'react-router-dom';
import { Button } from './button';

/**
 * Asks before unsaved work is thrown away: leaving for another page inside Wingstage shows this
 * question; reloading or closing the tab gets the browser's own question (browsers no longer show
 * a page's text there, only that changes may be lost).
 */
export function UnsavedChangesGuard({ when, what }: { when: boolean; what: string }) {
  const blocker = useBlocker(({ currentLocation, nextLocation }) => when && currentLocation.pathname !== nextLocation.pathname);

  useEffect(() => {
    if (!when) return;
    const ask = (e: BeforeUnloadEvent) => {
      e.preventDefault();
      // Older browsers need a returnValue to show their question.
      e.returnValue = '';
    };
    window.addEventListener('beforeunload', ask);
    return () => window.removeEventListener('beforeunload', ask);
  }, [when]);

  // Saved (or discarded) meanwhile: nothing is left to lose, so let the move go ahead.
  useEffect(() => {
    if (blocker.state === 'blocked' && !when) blocker.proceed();
  }, [blocker, when]);

  if (blocker.state !== 'blocked') return null;
  return (
    <div role="alertdialog" aria-modal="true" aria-labelledby="unsaved-title" aria-describedby="unsaved-text" className="fixed inset-0 z-50 flex items-end justify-center bg-slate/40 p-4 sm:items-center">
      <div className="flex w-full max-w-md flex-col gap-3 rounded-card border-2 border-slate-deep bg-cloth-raised p-4 shadow-lg">
        <h2 id="unsaved-title" className="text-lg font-semibold">
          Leave without saving?
        </h2>
        <p id="unsaved-text">You have changed {what} and not saved it. If you leave now, those changes are lost.</p>
        <div className="flex flex-wrap gap-2">
          <Button autoFocus onClick={() => blocker.reset()}>
            Stay on this page
          </Button>
          <Button variant="secondary" onClick={() => blocker.proceed()}>
            Leave without saving
          </Button>
        </div>
      </div>
    </div>
  );
}
