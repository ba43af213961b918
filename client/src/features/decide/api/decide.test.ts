import { QueryClient } from '@tanstack/react-query';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { ApiError } from '@/lib/api-client';
import { decisionPageQueryOptions } from './decide';

function jsonResponse(status: number, body: unknown): Response {
  return new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
}

describe("the decision page's data, asked for by decide.html before the scripts loaded", () => {
  const fetchMock = vi.fn<typeof fetch>();
  beforeEach(() => vi.stubGlobal('fetch', fetchMock));
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
    window.__wingstageDecideEarly = undefined;
  });

  it('when the early request is for this link, then the page takes its answer and asks nothing more; the next load asks afresh', async () => {
    window.__wingstageDecideEarly = { token: 'tok-early-0123456789', reply: Promise.resolve(jsonResponse(200, { state: 'sent', from: 'early' })) };
    const qc = new QueryClient();
    await expect(qc.fetchQuery(decisionPageQueryOptions('tok-early-0123456789'))).resolves.toEqual({ state: 'sent', from: 'early' });
    expect(fetchMock).not.toHaveBeenCalled();

    fetchMock.mockResolvedValueOnce(jsonResponse(200, { state: 'decided', from: 'fetch' }));
    await expect(qc.fetchQuery({ ...decisionPageQueryOptions('tok-early-0123456789'), staleTime: 0 })).resolves.toEqual({ state: 'decided', from: 'fetch' });
    expect(fetchMock).toHaveBeenCalledTimes(1);
    expect(fetchMock.mock.calls[0]![0]).toBe('/api/decide/tok-early-0123456789');
  });

  it('when the early request was for another link, then it is left alone and this one is fetched', async () => {
    window.__wingstageDecideEarly = { token: 'someone-else-0123456789', reply: Promise.resolve(jsonResponse(200, { from: 'early' })) };
    fetchMock.mockResolvedValueOnce(jsonResponse(200, { from: 'fetch' }));
    await expect(new QueryClient().fetchQuery(decisionPageQueryOptions('tok-mine-0123456789'))).resolves.toEqual({ from: 'fetch' });
    expect(window.__wingstageDecideEarly?.token).toBe('someone-else-0123456789');
  });

  it('when the early answer is an error, then the page gets the same error it would have got by asking itself', async () => {
    window.__wingstageDecideEarly = {
      token: 'tok-gone-0123456789',
      reply: Promise.resolve(jsonResponse(404, { error: { code: 'not_found', message: 'That link is not known.' } })),
    };
    const err = await new QueryClient().fetchQuery(decisionPageQueryOptions('tok-gone-0123456789')).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ApiError);
    expect((err as ApiError).status).toBe(404);
    expect((err as ApiError).message).toBe('That link is not known.');
  });

  it('when the early request never reached the server, then the page says so in the usual words', async () => {
    window.__wingstageDecideEarly = { token: 'tok-offline-0123456789', reply: Promise.reject(new TypeError('Failed to fetch')) };
    const err = await new QueryClient().fetchQuery(decisionPageQueryOptions('tok-offline-0123456789')).catch((e: unknown) => e);
    expect((err as ApiError).code).toBe('network');
  });
});
