import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { ApiError, api, readCookie, setUnauthorizedHandler, uploadWithProgress } from './api-client';

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

/** Just enough of XMLHttpRequest to watch what the upload sends and to answer it. */
class FakeXhr {
  static last: FakeXhr | null = null;
  method = '';
  url = '';
  withCredentials = false;
  headers: Record<string, string> = {};
  body: unknown = null;
  status = 0;
  responseText = '';
  upload: { onprogress: ((e: { lengthComputable: boolean; loaded: number; total: number }) => void) | null } = { onprogress: null };
  onload: (() => void) | null = null;
  onerror: (() => void) | null = null;
  constructor() {
    FakeXhr.last = this;
  }
  open(method: string, url: string) {
    this.method = method;
    this.url = url;
  }
  setRequestHeader(k: string, v: string) {
    this.headers[k] = v;
  }
  send(body: unknown) {
    this.body = body;
  }
  answer(status: number, body: unknown) {
    this.status = status;
    this.responseText = body === undefined ? '' : JSON.stringify(body);
    this.onload?.();
  }
}

describe('upload with progress', () => {
  beforeEach(() => {
    vi.stubGlobal('XMLHttpRequest', FakeXhr);
    document.cookie = 'ws_csrf=tok-456';
  });
  afterEach(() => {
    vi.unstubAllGlobals();
    FakeXhr.last = null;
    setUnauthorizedHandler(null);
    document.cookie = 'ws_csrf=; expires=Thu, 01 Jan 1970 00:00:00 GMT';
  });

  it('posts the files under "photos" with cookies and the CSRF header, reports progress and resolves with the reply', async () => {
    const seen: number[] = [];
    const done = uploadWithProgress('/jobs/j1/findings/f1/photos', [new File([new Uint8Array([0xff, 0xd8, 0xff])], 'a.jpg')], (f) => seen.push(f));
    const xhr = FakeXhr.last!;
    expect([xhr.method, xhr.url, xhr.withCredentials]).toEqual(['POST', '/api/jobs/j1/findings/f1/photos', true]);
    expect(xhr.headers['X-CSRF-Token']).toBe('tok-456');
    expect(Object.keys(xhr.headers).map((k) => k.toLowerCase())).not.toContain('content-type');
    expect(((xhr.body as FormData).getAll('photos') as File[]).map((f) => f.name)).toEqual(['a.jpg']);
    xhr.upload.onprogress?.({ lengthComputable: true, loaded: 250, total: 1000 });
    xhr.upload.onprogress?.({ lengthComputable: false, loaded: 0, total: 0 });
    xhr.upload.onprogress?.({ lengthComputable: true, loaded: 1000, total: 1000 });
    xhr.answer(201, [{ id: 'p1' }]);
    await expect(done).resolves.toEqual([{ id: 'p1' }]);
    expect(seen).toEqual([0.25, 1, 1]);
  });

  it('maps a refusal to the same ApiError as other calls, and a 401 to the sign-in handler', async () => {
    const onUnauthorized = vi.fn();
    setUnauthorizedHandler(onUnauthorized);
    const refused = uploadWithProgress('/x', [], () => {});
    FakeXhr.last!.answer(413, { error: { code: 'too_large', message: 'big.jpg is larger than 15 MB.' } });
    await expect(refused).rejects.toMatchObject({ code: 'too_large', status: 413, message: 'big.jpg is larger than 15 MB.' });
    const signedOut = uploadWithProgress('/x', [], () => {});
    FakeXhr.last!.answer(401, { error: { code: 'unauthenticated', message: 'Please sign in.' } });
    await expect(signedOut).rejects.toMatchObject({ status: 401 });
    expect(onUnauthorized).toHaveBeenCalledOnce();
  });

  it('maps a dropped connection to a readable network error', async () => {
    const lost = uploadWithProgress('/x', [], () => {});
    FakeXhr.last!.onerror?.();
    await expect(lost).rejects.toMatchObject({ code: 'network', status: 0 });
  });
});
