// Typed errors, turned into HTTP in one place (error-handler.ts).
import type { ZodError } from 'zod';
import type { FieldError } from '../../shared/schemas/common';
// Every error the server answers with its own status and words is a Failure (the error handler
// writes its `toAnswer()`); the client's ApiError is one too.
import { Failure as AppError } from '../../shared/schemas/error';

export type { FieldError };
export { AppError };

export class Invalid extends AppError {
  constructor(message: string, fields: FieldError[] = []) {
    super(400, 'invalid', message, fields);
  }

  static fromZod(where: string, error: ZodError): Invalid {
    const fields = error.issues.map((i) => ({
      field: [where, ...i.path.map(String)].join('.'),
      message: i.message,
    }));
    const first = fields[0];
    return new Invalid(first ? `${first.field}: ${first.message}` : `invalid ${where}`, fields);
  }
}

export class Unauthenticated extends AppError {
  constructor(message = 'sign in first') {
    super(401, 'unauthenticated', message);
  }
}

export class Forbidden extends AppError {
  constructor(message = 'your role does not allow this') {
    super(403, 'forbidden', message);
  }
}

export class NotFound extends AppError {
  constructor(what: string) {
    super(404, 'not_found', `${what} not found`);
  }
}

export class Conflict extends AppError {
  constructor(message: string) {
    super(409, 'conflict', message);
  }
}

/** Over a limit (throttle or quota): the answer says when to try again, also as Retry-After. */
export class TooManyRequests extends AppError {
  constructor(
    message: string,
    readonly retryAfterS: number,
  ) {
    super(429, 'too_many_requests', message);
  }
}

/** The database cannot answer now (down, a lock held too long, a statement over its time). */
export class Unavailable extends AppError {
  constructor(
    message: string,
    readonly retryAfterS = 5,
  ) {
    super(503, 'unavailable', message);
  }
}

/** In hours, minutes or seconds for people: "21 h", "12 min", "40 s". */
export function waitText(seconds: number): string {
  const s = Math.max(1, Math.ceil(seconds));
  if (s >= 2 * 3600) return `${Math.ceil(s / 3600)} h`;
  return s >= 90 ? `${Math.ceil(s / 60)} min` : `${s} s`;
}
