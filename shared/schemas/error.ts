// A failed API answer, `{ error: { code, message, fields } }`, written once: the server's error
// handler writes it (server/http/error-handler.ts) and the client's one HTTP client reads it with
// this schema (src/lib/api-client.ts); both sides hold a failure as a `Failure`.
import * as z from 'zod';
import { fieldError, type FieldError } from './common';

export const errorAnswer = z.object({
  error: z.object({ code: z.string(), message: z.string(), fields: z.array(fieldError).default([]) }),
});
export type ErrorAnswer = z.infer<typeof errorAnswer>;

/** A failed request: the HTTP status, and the answer's code, message and the fields at fault. */
export class Failure extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields: FieldError[] = [],
  ) {
    super(message);
  }

  /** The JSON answer that carries it. */
  toAnswer(): ErrorAnswer {
    return { error: { code: this.code, message: this.message, fields: this.fields } };
  }
}
