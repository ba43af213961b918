import { QueryClient } from '@tanstack/react-query';
import { isApiError } from './api-client';

export function makeQueryClient(): QueryClient {
  return new QueryClient({
    defaultOptions: {
      queries: {
        staleTime: 30_000,
        // A 4xx will not fix itself on retry; only network blips and 5xx are worth one more try.
        retry: (count, err) => count < 1 && !(isApiError(err) && err.status >= 400 && err.status < 500),
        refetchOnWindowFocus: false,
      },
    },
  });
}

export const queryClient = makeQueryClient();
