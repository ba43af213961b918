import type { DecisionPageDto, DecisionSubmitInput } from '@wingstage/shared';
import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import { api, readReply } from '@/lib/api-client';
import { clearDraft, deviceStorage } from '../draft';

/** The owner's page is reached by its link alone, so it keys on the token and never on a session. */
export const decideKeys = {
  all: ['decide'] as const,
  page: (token: string) => [...decideKeys.all, token] as const,
};

declare global {
  interface Window {
    /** Set by decide.html's inline script: the decision data, asked for before the scripts loaded. */
    __wingstageDecideEarly?: { token: string; reply: Promise<Response> };
  }
}

/** The early request for this token, once: later loads (a reload after deciding) ask afresh. */
function takeEarlyReply(token: string): Promise<Response> | null {
  const early = typeof window === 'undefined' ? undefined : window.__wingstageDecideEarly;
  if (!early || early.token !== token) return null;
  window.__wingstageDecideEarly = undefined;
  return early.reply;
}

export const decisionPageQueryOptions = (token: string) =>
  queryOptions({
    queryKey: decideKeys.page(token),
    queryFn: ({ signal }) => {
      const early = takeEarlyReply(token);
      return early ? readReply<DecisionPageDto>(early) : api.get<DecisionPageDto>(`/decide/${encodeURIComponent(token)}`, undefined, signal);
    },
    // The owner reads at their own pace; a refetch mid-choice must not reshuffle the page.
    refetchOnWindowFocus: false,
    retry: false,
  });

export function useSubmitDecisions(token: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: DecisionSubmitInput) => api.post<DecisionPageDto>(`/decide/${encodeURIComponent(token)}`, body, { skipUnauthorizedRedirect: true }),
    onSuccess: (page) => {
      // Confirmed: the choices kept on the device have done their job (cleared before the receipt shows).
      clearDraft(deviceStorage(), page.snapshot.requestId);
      qc.setQueryData(decideKeys.page(token), page);
    },
  });
}
