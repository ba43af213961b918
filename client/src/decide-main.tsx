import { createRoot, hydrateRoot } from 'react-dom/client';
import { DecideRoot, FIRST_VIEW_ID, primeFirstView, type DecideFirstView } from './decide-first-view';
import { deviceStorage, hasStoredDraft } from './features/decide/draft';
import { tokenFromPath } from './features/decide/token';
import { queryClient } from './lib/query-client';
import './index.css';

// The owner's decision page on its own: no router, no app shell, no sign-in. The token comes
// straight from the address bar. When the server sent the first view as HTML (with the data it
// was made from), React takes over that markup; otherwise it renders from nothing.
const root = document.getElementById('root')!;
const token = tokenFromPath(window.location.pathname);
const carried = document.getElementById(FIRST_VIEW_ID)?.textContent;
const parsed = carried ? (JSON.parse(carried) as DecideFirstView) : null;
const view = parsed && parsed.token === token ? parsed : null;
if (view) primeFirstView(queryClient, view);
// Choices kept on this device from an earlier visit change what the page first shows (the step,
// the marks): then React draws the page afresh from the same data (replacing the server's markup
// at its first commit) rather than take over markup made without them.
const kept = view?.page ? hasStoredDraft(deviceStorage(), view.page.snapshot.requestId) : false;
const tree = <DecideRoot client={queryClient} token={token} known={view?.page !== null} />;

if (view && root.firstElementChild && !kept) hydrateRoot(root, tree);
else createRoot(root).render(tree);
