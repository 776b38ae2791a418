import { HttpContextToken, HttpErrorResponse } from '@angular/common/http';

/** The one error shape of the API: `{ error: { code, message, fields? } }`. */
export interface ApiError {
  status: number;
  code: string;
  message: string;
  fields: Record<string, string>;
}

/**
 * Set on a request whose caller shows the error itself (for example the sign-in form, or the
 * board putting a card back); the error interceptor then stays quiet.
 */
export const HANDLES_OWN_ERRORS = new HttpContextToken<boolean>(() => false);

/**
 * Set beside HANDLES_OWN_ERRORS where a 401 can only mean that the session ended (a move on the
 * board or the ticket page, in the middle of a drag): the interceptor still ends the session and
 * sends the person to sign in, while the caller handles every other error. Not for the sign-in
 * and password forms, whose 401 means a wrong password.
 */
export const SESSION_ENDS_ON_401 = new HttpContextToken<boolean>(() => false);

/** Reads any HTTP failure into the API's error shape, with wording a person can act on. */
export function readApiError(err: unknown): ApiError {
  if (err instanceof HttpErrorResponse) {
    const body = err.error as { error?: { code?: unknown; message?: unknown; fields?: unknown } } | null;
    const inner = body && typeof body === 'object' ? body.error : undefined;
    if (inner && typeof inner.message === 'string') {
      return {
        status: err.status,
        code: typeof inner.code === 'string' ? inner.code : 'error',
        message: inner.message,
        fields: isStringRecord(inner.fields) ? inner.fields : {},
      };
    }
    if (err.status === 0) {
      return { status: 0, code: 'network_error', message: 'The bench server cannot be reached. Check the connection and try again.', fields: {} };
    }
    if (err.status >= 500) {
      return { status: err.status, code: 'internal_error', message: 'Something went wrong on the server. Try again in a moment.', fields: {} };
    }
    return { status: err.status, code: 'error', message: `The request was refused (${err.status}).`, fields: {} };
  }
  return { status: 0, code: 'error', message: 'Something went wrong. Try again.', fields: {} };
}

function isStringRecord(value: unknown): value is Record<string, string> {
  return !!value && typeof value === 'object' && Object.values(value).every((v) => typeof v === 'string');
}

/** Query of a list route: `?page=1&pageSize=25&sort=field&dir=asc|desc&q=text`. */
export interface ListQuery {
  page: number;
  pageSize: number;
  sort?: string;
  dir?: 'asc' | 'desc';
  q?: string;
}

/** Turns a query object into HttpParams-compatible values, leaving out empty ones. */
export function queryParams(query: object): Record<string, string | number> {
  const out: Record<string, string | number> = {};
  for (const [key, value] of Object.entries(query)) {
    if (value === undefined || value === null || value === '') continue;
    out[key] = typeof value === 'number' ? value : String(value);
  }
  return out;
}
