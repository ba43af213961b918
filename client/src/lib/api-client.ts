import type { ApiErrorBody, ApiErrorCode } from '@wingstage/shared';

/** An API failure in the shared error shape, or a network failure mapped onto it. */
export class ApiError extends Error {
  readonly code: ApiErrorCode | 'network';
  readonly status: number;
  readonly fields: Record<string, string>;
  readonly requestId: string | undefined;

  constructor(init: { code: ApiErrorCode | 'network'; message: string; status: number; fields?: Record<string, string>; requestId?: string }) {
    super(init.message);
    this.name = 'ApiError';
    this.code = init.code;
    this.status = init.status;
    this.fields = init.fields ?? {};
    this.requestId = init.requestId;
  }
}

export function isApiError(e: unknown): e is ApiError {
  return e instanceof ApiError;
}

const UNSAFE = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

export function readCookie(name: string, cookieString: string = typeof document === 'undefined' ? '' : document.cookie): string | null {
  for (const part of cookieString.split(';')) {
    const [k, ...rest] = part.trim().split('=');
    if (k === name) return decodeURIComponent(rest.join('='));
  }
  return null;
}

type UnauthorizedListener = () => void;
let onUnauthorized: UnauthorizedListener | null = null;
/** The router registers this so a 401 on a protected page goes to sign-in (keeping the return path). */
export function setUnauthorizedHandler(fn: UnauthorizedListener | null): void {
  onUnauthorized = fn;
}

/** The shared error shape in a failed reply's body, or a plain message when the body is something else. */
function errorFromBody(status: number, body: unknown): ApiError {
  const err = (body as Partial<ApiErrorBody> | null)?.error;
  if (err && typeof err.code === 'string' && typeof err.message === 'string') {
    return new ApiError({ code: err.code, message: err.message, status, fields: err.fields, requestId: err.requestId });
  }
  return new ApiError({
    code: status === 404 ? 'not_found' : status >= 500 ? 'internal' : 'conflict',
    message: status >= 500 ? 'The server could not finish that. Please try again in a moment.' : `The request failed (${status}).`,
    status,
  });
}

async function parseError(res: Response): Promise<ApiError> {
  let body: unknown = null;
  try {
    body = await res.json();
  } catch {
    // A proxy or crash page is not JSON; fall through to a generic message.
  }
  return errorFromBody(res.status, body);
}

const NETWORK_MESSAGE = 'Wingstage could not reach the server. Check the connection and try again.';

export interface RequestOptions {
  method?: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  body?: unknown;
  query?: Record<string, string | number | undefined | null>;
  signal?: AbortSignal;
  /** Sign-in and session probes must not bounce to the sign-in page on 401. */
  skipUnauthorizedRedirect?: boolean;
}

export function buildUrl(path: string, query?: RequestOptions['query']): string {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(query ?? {})) {
    if (v !== undefined && v !== null && v !== '') params.set(k, String(v));
  }
  const qs = params.toString();
  return `/api${path}${qs ? `?${qs}` : ''}`;
}

export async function apiRequest<T>(path: string, opts: RequestOptions = {}): Promise<T> {
  const method = opts.method ?? 'GET';
  const headers: Record<string, string> = { Accept: 'application/json' };
  // A multipart body carries its own boundary in Content-Type: the browser must write that header.
  const isForm = typeof FormData !== 'undefined' && opts.body instanceof FormData;
  if (opts.body !== undefined && !isForm) headers['Content-Type'] = 'application/json';
  if (UNSAFE.has(method)) {
    const csrf = readCookie('ws_csrf');
    if (csrf) headers['X-CSRF-Token'] = csrf;
  }
  let sent: Promise<Response>;
  try {
    sent = fetch(buildUrl(path, opts.query), {
      method,
      headers,
      credentials: 'include',
      body: opts.body === undefined ? undefined : isForm ? (opts.body as FormData) : JSON.stringify(opts.body),
      signal: opts.signal,
    });
  } catch (e) {
    sent = Promise.reject(e);
  }
  return readReply<T>(sent, opts);
}

/**
 * The reply to a request already sent (by apiRequest, or by a page that asked early, before its
 * scripts loaded), read with the same error mapping.
 */
export async function readReply<T>(sent: Promise<Response>, opts: Pick<RequestOptions, 'skipUnauthorizedRedirect'> = {}): Promise<T> {
  let res: Response;
  try {
    res = await sent;
  } catch (e) {
    if ((e as Error).name === 'AbortError') throw e;
    throw new ApiError({ code: 'network', message: NETWORK_MESSAGE, status: 0 });
  }
  if (!res.ok) {
    const err = await parseError(res);
    if (res.status === 401 && !opts.skipUnauthorizedRedirect) onUnauthorized?.();
    throw err;
  }
  if (res.status === 204 || res.status === 202) return undefined as T;
  const text = await res.text();
  return (text ? JSON.parse(text) : undefined) as T;
}

/**
 * Posts files as multipart/form-data and reports how much has been sent (0 to 1), which a phone on
 * a weak hangar signal needs to see. fetch cannot report upload progress, so this one request
 * goes through XMLHttpRequest, with the same CSRF header, cookies and error mapping as the rest.
 */
export function uploadWithProgress<T>(path: string, files: readonly File[], onProgress: (fraction: number) => void, field = 'photos'): Promise<T> {
  const form = new FormData();
  for (const f of files) form.append(field, f, f.name);
  return new Promise<T>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', buildUrl(path));
    xhr.withCredentials = true;
    xhr.setRequestHeader('Accept', 'application/json');
    const csrf = readCookie('ws_csrf');
    if (csrf) xhr.setRequestHeader('X-CSRF-Token', csrf);
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable && e.total > 0) onProgress(Math.min(1, e.loaded / e.total));
    };
    xhr.onload = () => {
      let body: unknown = undefined;
      try {
        body = xhr.responseText ? JSON.parse(xhr.responseText) : undefined;
      } catch {
        body = null;
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        onProgress(1);
        resolve(body as T);
        return;
      }
      if (xhr.status === 401) onUnauthorized?.();
      reject(errorFromBody(xhr.status, body));
    };
    xhr.onerror = () => reject(new ApiError({ code: 'network', message: NETWORK_MESSAGE, status: 0 }));
    xhr.send(form);
  });
}

export const api = {
  get: <T>(path: string, query?: RequestOptions['query'], signal?: AbortSignal) => apiRequest<T>(path, { query, signal }),
  post: <T>(path: string, body?: unknown, extra?: Partial<RequestOptions>) => apiRequest<T>(path, { ...extra, method: 'POST', body: body ?? {} }),
  patch: <T>(path: string, body: unknown) => apiRequest<T>(path, { method: 'PATCH', body }),
  delete: <T = void>(path: string, body?: unknown) => apiRequest<T>(path, { method: 'DELETE', body }),
  /** Posts files as multipart/form-data, each under `field`; CSRF and errors as for any other write. */
  upload: <T>(path: string, files: readonly File[], field = 'photos', extra?: Partial<Pick<RequestOptions, 'signal'>>) => {
    const form = new FormData();
    for (const f of files) form.append(field, f, f.name);
    return apiRequest<T>(path, { ...extra, method: 'POST', body: form });
  },
};
