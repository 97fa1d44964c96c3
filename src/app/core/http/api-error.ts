import { HttpContextToken, HttpErrorResponse } from '@angular/common/http';
import { apiErrorSchema } from '../../../../shared/schemas/api-error';

/** Set on a request whose caller shows its errors beside the form, so the interceptor adds no snackbar. */
export const INLINE_ERRORS = new HttpContextToken<boolean>(() => false);

export interface FieldIssue {
  path: string;
  message: string;
}

export interface ApiFailure {
  status: number;
  code: string;
  message: string;
  issues: FieldIssue[];
}

const fallbackMessages: Record<number, string> = {
  0: 'Tuckline could not reach the server. Check your connection and try again.',
  413: 'That is too large for the server to accept.',
  500: 'Something went wrong on the server. Try again in a moment.',
};

/**
 * Reads the API's one error shape (docs/api.md) out of any HTTP failure. An
 * error that wraps another in `cause` (a resource's error wraps the HTTP
 * failure it met) is read through its cause.
 */
export function toApiFailure(err: unknown): ApiFailure {
  const cause = !(err instanceof HttpErrorResponse) && typeof err === 'object' && err !== null ? (err as { cause?: unknown }).cause : undefined;
  if (cause !== undefined) return toApiFailure(cause);
  if (!(err instanceof HttpErrorResponse)) {
    return { status: -1, code: 'client', message: err instanceof Error ? err.message : String(err), issues: [] };
  }
  const parsed = apiErrorSchema.safeParse(err.error);
  if (parsed.success) {
    const { code, message, details } = parsed.data.error;
    return { status: err.status, code, message, issues: readIssues(details) };
  }
  const message = fallbackMessages[err.status] ?? (err.status >= 500 ? fallbackMessages[500] : `The request failed (${err.status} ${err.statusText}).`);
  return { status: err.status, code: err.status === 0 ? 'network' : 'http', message, issues: [] };
}

function readIssues(details: unknown): FieldIssue[] {
  if (!Array.isArray(details)) return [];
  return details.flatMap((d: unknown) => {
    if (typeof d !== 'object' || d === null) return [];
    const { path, message } = d as { path?: unknown; message?: unknown };
    if (typeof message !== 'string') return [];
    const joined = Array.isArray(path) ? path.join('.') : typeof path === 'string' ? path : '';
    return [{ path: joined, message }];
  });
}
