import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { ApiError, api, readCookie, setUnauthorizedHandler } from './api-client';

function jsonResponse(status: number, body: unknown): Response {
  return new Response(body === undefined ? null : JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } });
}

describe('api client', () => {
  const fetchMock = vi.fn<typeof fetch>();

  beforeEach(() => {
    vi.stubGlobal('fetch', fetchMock);
    document.cookie = 'ws_csrf=tok-123';
  });
  afterEach(() => {
    vi.unstubAllGlobals();
    fetchMock.mockReset();
    setUnauthorizedHandler(null);
    document.cookie = 'ws_csrf=; expires=Thu, 01 Jan 1970 00:00:00 GMT';
  });

  it('sends the CSRF cookie back as X-CSRF-Token on a write, with credentials', async () => {
    fetchMock.mockResolvedValueOnce(jsonResponse(201, { id: 'c1' }));
    await expect(api.post('/customers', { name: 'A' })).resolves.toEqual({ id: 'c1' });
    const [url, init] = fetchMock.mock.calls[0]!;
    expect(url).toBe('/api/customers');
    expect(init?.method).toBe('POST');
    expect(init?.credentials).toBe('include');
    expect((init?.headers as Record<string, string>)['X-CSRF-Token']).toBe('tok-123');
    expect(init?.body).toBe('{"name":"A"}');
  });

  it('sends no CSRF header on a read and builds the list query', async () => {
    fetchMock.mockResolvedValueOnce(jsonResponse(200, { items: [], total: 0, page: 1, pageSize: 20 }));
    await api.get('/jobs', { q: 'brka', state: 'in_work', page: 2, sort: undefined });
    const [url, init] = fetchMock.mock.calls[0]!;
    expect(url).toBe('/api/jobs?q=brka&state=in_work&page=2');
    expect((init?.headers as Record<string, string>)['X-CSRF-Token']).toBeUndefined();
  });

  it('turns the shared error shape into an ApiError with code, message, fields and status', async () => {
    fetchMock.mockResolvedValueOnce(
      jsonResponse(400, { error: { code: 'validation_failed', message: 'Check the form.', fields: { email: 'Enter a valid e-mail address.' }, requestId: 'r1' } }),
    );
    const err = await api.post('/customers', {}).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(ApiError);
    expect(err).toMatchObject({ code: 'validation_failed', status: 400, message: 'Check the form.', fields: { email: 'Enter a valid e-mail address.' }, requestId: 'r1' });
  });

  it('gives a plain message when the server answers with something other than the error shape', async () => {
    fetchMock.mockResolvedValueOnce(new Response('<html>Bad gateway</html>', { status: 502 }));
    const err = (await api.get('/jobs').catch((e: unknown) => e)) as ApiError;
    expect(err.code).toBe('internal');
    expect(err.status).toBe(502);
    expect(err.message).toMatch(/could not finish/);
  });

  it('calls the sign-in handler on a 401 from a protected call', async () => {
    const onUnauthorized = vi.fn();
    setUnauthorizedHandler(onUnauthorized);
    fetchMock.mockResolvedValueOnce(jsonResponse(401, { error: { code: 'unauthenticated', message: 'Please sign in.' } }));
    await expect(api.get('/jobs')).rejects.toMatchObject({ status: 401, code: 'unauthenticated' });
    expect(onUnauthorized).toHaveBeenCalledOnce();
  });

  it('maps a network failure to a readable error', async () => {
    fetchMock.mockRejectedValueOnce(new TypeError('Failed to fetch'));
    await expect(api.get('/jobs')).rejects.toMatchObject({ code: 'network', status: 0 });
  });

  it('reads one cookie out of several', () => {
    expect(readCookie('ws_csrf', 'a=1; ws_csrf=x%3Dy; b=2')).toBe('x=y');
    expect(readCookie('missing', 'a=1')).toBeNull();
  });
});
