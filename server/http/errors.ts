// Typed errors, turned into HTTP in one place (error-handler.ts).
import type { ZodError } from 'zod';
import type { FieldError } from '../../shared/schemas/common';

export type { FieldError };

export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields: FieldError[] = [],
  ) {
    super(message);
  }
}

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
