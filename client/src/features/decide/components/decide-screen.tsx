import { useQuery, useQueryClient } from '@tanstack/react-query';
import { Caution, Loading, Notice } from '@/components/ui/notice';
import { Wordmark } from '@/components/ui/wordmark';
import { isApiError } from '@/lib/api-client';
import { decideKeys, decisionPageQueryOptions, useSubmitDecisions } from '../api/decide';
import { DecisionPage, UnknownLink } from './decision-page';

/**
 * The owner's decision page, opened from the e-mailed link with no sign-in. It stands outside the
 * app shell (and has its own light entry, decide.html) so the letter reads on its own.
 */
export function DecideScreen({ token }: { token: string }) {
  const qc = useQueryClient();
  const page = useQuery({ ...decisionPageQueryOptions(token), enabled: token.length > 0 });
  const submit = useSubmitDecisions(token);
  // Room below the letter for the running total fixed at the foot of the screen.
  const deciding = page.data?.state === 'sent' && !page.data.closedReason;
  return (
    <div className={`min-h-dvh px-gutter pt-5 ${deciding ? 'pb-52' : 'pb-5'}`}>
      <main id="main" className="mx-auto w-full max-w-xl">
        {!token ? (
          <UnknownLink />
        ) : page.data ? (
          <DecisionPage
            page={page.data}
            token={token}
            submitting={submit.isPending}
            onSubmit={(body) => submit.mutateAsync(body)}
            onReload={() => void qc.invalidateQueries({ queryKey: decideKeys.page(token) })}
          />
        ) : page.isError ? (
          isApiError(page.error) && page.error.status === 404 ? (
            <UnknownLink />
          ) : (
            <Notice tone="problem" title="This page could not be loaded">
              {page.error.message}
            </Notice>
          )
        ) : (
          <Loading label="Opening your request…" />
        )}
        <Caution>
          You decide whether to pay for this work. Whether the aircraft may fly is not decided here: the licensed inspector decides, under the authority's rules and
          the manufacturer's data.
        </Caution>
        <footer className="mt-4 flex items-center gap-2 text-xs text-slate-soft">
          <span>Sent through</span>
          <Wordmark className="h-5 w-auto" />
        </footer>
      </main>
    </div>
  );
}
