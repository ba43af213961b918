import { QueryClientProvider, type QueryClient } from '@tanstack/react-query';
import type { DecisionPageDto } from '@wingstage/shared';
import { StrictMode } from 'react';
import { decideKeys } from './features/decide/api/decide';
import { DecideScreen } from './features/decide/components/decide-screen';

/**
 * What the server put in the decision page's HTML beside its first view (decide-ssr.tsx): the
 * page's data for this token, or `page: null` when the link is not a valid one. The browser takes
 * it instead of asking again, so the markup React hydrates is the markup the server sent.
 */
export interface DecideFirstView {
  token: string;
  page: DecisionPageDto | null;
}

/** The id of the `<script type="application/json">` that carries it. */
export const FIRST_VIEW_ID = 'wingstage-decide-data';

/**
 * The page's whole tree, the same on the server and in the browser. An unknown link is rendered
 * as the page renders a link that is not whole (the one answer for both), without asking again.
 */
export function DecideRoot({ client, token, known }: { client: QueryClient; token: string; known: boolean }) {
  return (
    <StrictMode>
      <QueryClientProvider client={client}>
        <DecideScreen token={known ? token : ''} />
      </QueryClientProvider>
    </StrictMode>
  );
}

/** Puts the server's answer where the page's query looks for it. */
export function primeFirstView(client: QueryClient, view: DecideFirstView): void {
  if (view.page) client.setQueryData(decideKeys.page(view.token), view.page);
}
