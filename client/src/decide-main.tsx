import { QueryClientProvider } from '@tanstack/react-query';
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { DecideScreen } from './features/decide/components/decide-screen';
import { tokenFromPath } from './features/decide/token';
import { queryClient } from './lib/query-client';
import './index.css';

// The owner's decision page on its own: no router, no app shell, no sign-in. The token comes
// straight from the address bar.
createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <QueryClientProvider client={queryClient}>
      <DecideScreen token={tokenFromPath(window.location.pathname)} />
    </QueryClientProvider>
  </StrictMode>,
);
