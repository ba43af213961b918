import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import { Caution, Loading, Notice } from '@/components/ui/notice';
import { decideKeys, decisionPageQueryOptions, useSubmitDecisions } from '@/features/decide/api/decide';
import { DecisionPage, UnknownLink } from '@/features/decide/components/decision-page';
import { isApiError } from '@/lib/api-client';

/**
 * The owner's decision page, opened from the e-mailed link with no sign-in. It stays outside the
 * app shell so a phone downloads only this page and the letter reads on its own.
 */
export function Component() {
  const { token } = useParams() as { token: string };
  const qc = useQueryClient();
  const page = useQuery(decisionPageQueryOptions(token));
  const submit = useSubmitDecisions(token);
  // Room below the letter for the running total fixed at the foot of the screen.
  const deciding = page.data?.state === 'sent' && !page.data.closedReason;
  return (
    <div className={`min-h-dvh px-gutter pt-5 ${deciding ? 'pb-52' : 'pb-5'}`}>
      <main id="main" className="mx-auto w-full max-w-xl">
        {page.data ? (
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
          Your decisions are about cost. Whether the aircraft may fly follows the manufacturer's data and the authority's rules, and is for the licensed inspector to
          decide.
        </Caution>
      </main>
    </div>
  );
}
