// Typed errors thrown by services and handlers; the central error handler in app.ts turns them
// into the one error shape of the API: { error: { code, message, fields? } }.
import type { ZodError } from 'zod';
import './schemas'; // plain-words messages for every schema

export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: Record<string, string>,
  ) {
    super(message);
    this.name = 'AppError';
  }

  toBody() {
    return { error: { code: this.code, message: this.message, ...(this.fields ? { fields: this.fields } : {}) } };
  }
}

export class ValidationError extends AppError {
  constructor(message: string, fields?: Record<string, string>) {
    super(400, 'validation_failed', message, fields);
  }

  /** Turns zod's issues into one message per field (the first issue of each path). */
  static fromZod(err: ZodError, message = 'Some fields need attention.'): ValidationError {
    const fields: Record<string, string> = {};
    for (const issue of err.issues) {
      const key = issue.path.length ? issue.path.join('.') : '_';
      if (!(key in fields)) fields[key] = issue.message;
    }
    const only = Object.keys(fields);
    const text = only.length === 1 ? `${only[0] === '_' ? '' : `${only[0]}: `}${fields[only[0]]}` : message;
    return new ValidationError(text, fields);
  }
}

export class UnauthenticatedError extends AppError {
  constructor(message = 'Sign in to continue.') {
    super(401, 'not_signed_in', message);
  }
}

export class ForbiddenError extends AppError {
  constructor(message = 'Your account is not allowed to do that.', code = 'forbidden') {
    super(403, code, message);
  }
}

export class NotFoundError extends AppError {
  constructor(message = 'Not found.', code = 'not_found') {
    super(404, code, message);
  }
}

export class ConflictError extends AppError {
  constructor(code: string, message: string) {
    super(409, code, message);
  }
}

export class RuleError extends AppError {
  constructor(code: string, message: string) {
    super(422, code, message);
  }
}

/** Parses input with a zod schema, throwing a 400 ValidationError with per-field messages. */
export function parseInput<T>(schema: { safeParse(input: unknown): { success: true; data: T } | { success: false; error: ZodError } }, input: unknown): T {
  const result = schema.safeParse(input);
  if (!result.success) throw ValidationError.fromZod(result.error);
  return result.data;
}
