import { renderToString } from 'react-dom/server';
import { DecideRoot, FIRST_VIEW_ID, primeFirstView, type DecideFirstView } from './decide-first-view';
import { makeQueryClient } from './lib/query-client';

/**
 * The decision page's first view as HTML, for the server to send before any script has run
 * (built apart by `vite build --ssr`, into client/dist-ssr, and loaded by the server by path: the
 * server imports no client code). The browser's entry (decide-main.tsx) hydrates the same tree.
 */
export function renderDecidePage(view: DecideFirstView): { html: string; data: string } {
  const client = makeQueryClient();
  primeFirstView(client, view);
  const html = renderToString(<DecideRoot client={client} token={view.token} known={view.page !== null} />);
  client.clear();
  // Inside <script type="application/json">: "<" is escaped so no value can close the element.
  const data = JSON.stringify(view).replace(/</g, '\\u003c');
  return { html, data: `<script type="application/json" id="${FIRST_VIEW_ID}">${data}</script>` };
}
