import { QueryClientProvider } from '@tanstack/react-query';
import { render } from '@testing-library/react';
import type { ReactElement } from 'react';
import { createMemoryRouter, RouterProvider } from 'react-router-dom';
import { makeQueryClient } from '@/lib/query-client';

/** Renders one element inside a memory router and a fresh query client, as the app would. */
export function renderWithApp(ui: ReactElement, { path = '/' } = {}) {
  const queryClient = makeQueryClient();
  const router = createMemoryRouter([{ path: '*', element: ui }], { initialEntries: [path] });
  const result = render(
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>,
  );
  return { ...result, queryClient, router };
}
