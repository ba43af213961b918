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
  | 'too_many_requests'
  | 'token_invalid'
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
