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

  it('uploads files as multipart under "photos" with the CSRF header and without setting Content-Type', async () => {
    fetchMock.mockResolvedValueOnce(jsonResponse(201, [{ id: 'p1' }]));
    const a = new File([new Uint8Array([0xff, 0xd8, 0xff, 0xe0])], 'plug.jpg', { type: 'image/jpeg' });
    const b = new File([new Uint8Array([0x89, 0x50, 0x4e, 0x47])], 'cowl.png', { type: 'image/png' });
    await expect(api.upload('/jobs/j1/findings/f1/photos', [a, b])).resolves.toEqual([{ id: 'p1' }]);
    const [url, init] = fetchMock.mock.calls[0]!;
    expect(url).toBe('/api/jobs/j1/findings/f1/photos');
    expect(init?.method).toBe('POST');
    expect(init?.credentials).toBe('include');
    const headers = init?.headers as Record<string, string>;
    expect(headers['X-CSRF-Token']).toBe('tok-123');
    // The browser writes multipart/form-data with its boundary; a hand-set header would lose it.
    expect(Object.keys(headers).map((k) => k.toLowerCase())).not.toContain('content-type');
    const form = init?.body as FormData;
    expect(form).toBeInstanceOf(FormData);
    const sent = form.getAll('photos') as File[];
    expect(sent.map((f) => f.name)).toEqual(['plug.jpg', 'cowl.png']);
    expect([...form.keys()].every((k) => k === 'photos')).toBe(true);
  });

  it('maps a refused upload to an ApiError carrying the server message', async () => {
    fetchMock.mockResolvedValueOnce(jsonResponse(415, { error: { code: 'unsupported_type', message: 'notes.jpg is not a JPEG, PNG or WebP picture.', requestId: 'r9' } }));
    const err = (await api.upload('/jobs/j1/findings/f1/photos', [new File(['hello'], 'notes.jpg', { type: 'image/jpeg' })]).catch((e: unknown) => e)) as ApiError;
    expect(err).toBeInstanceOf(ApiError);
    expect(err).toMatchObject({ code: 'unsupported_type', status: 415, message: 'notes.jpg is not a JPEG, PNG or WebP picture.' });
  });

  it('sends a DELETE with the CSRF header and no body, and reads a 204 as nothing', async () => {
    fetchMock.mockResolvedValueOnce(new Response(null, { status: 204 }));
    await expect(api.delete('/jobs/j1/findings/f1/photos/p1')).resolves.toBeUndefined();
    const [url, init] = fetchMock.mock.calls[0]!;
    expect(url).toBe('/api/jobs/j1/findings/f1/photos/p1');
    expect(init?.method).toBe('DELETE');
    expect(init?.body).toBeUndefined();
    expect((init?.headers as Record<string, string>)['X-CSRF-Token']).toBe('tok-123');
  });

  it('reads one cookie out of several', () => {
    expect(readCookie('ws_csrf', 'a=1; ws_csrf=x%3Dy; b=2')).toBe('x=y');
    expect(readCookie('missing', 'a=1')).toBeNull();
  });
});
