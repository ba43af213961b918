/** The one JSON error shape every API error uses. */
export type ApiErrorCode =
  | 'validation_failed'
  | 'unauthenticated'
  | 'forbidden'
  | 'csrf_failed'
  | 'not_found'
  | 'conflict'
  | 'stale_version'
  | 'invalid_transition'
  /** 422: an amount the money helpers or the pricing engine cannot accept; the message says which and why. */
  | 'invalid_amount'
  | 'too_many_requests'
  | 'token_invalid'
  /** 413: a file (or body) is larger than the server accepts; the message names it and the limit. */
  | 'too_large'
  /** 415: a file is not of a kind the server accepts, judged by its content. */
  | 'unsupported_type'
  /** 503: the database (or another part the server needs) is briefly out of reach; `Retry-After` says when to try again. */
  | 'unavailable'
  | 'internal';

export interface ApiErrorBody {
  error: {
    code: ApiErrorCode;
    message: string;
    /** Field path (dot-joined) → message, for validation errors. */
    fields?: Record<string, string>;
    requestId?: string;
  };
}
