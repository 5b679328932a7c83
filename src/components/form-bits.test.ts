// The account and team forms show one message per field, whether the phone's zod check or the
// server's 400 refused the input.
import { describe, expect, it } from 'vitest';
import * as z from 'zod';
import { ApiError } from '@/lib/api-client';
import { fieldErrors } from './form-bits';

describe('fieldErrors', () => {
  it("names the field of the server's 400 without its body. prefix, first message only", () => {
    const err = new ApiError(400, 'invalid', 'the request is not valid', [
      { field: 'body.email', message: 'not an e-mail address' },
      { field: 'body.email', message: 'too long' },
      { field: 'body.role', message: 'not a role' },
    ]);
    expect(fieldErrors(err)).toEqual({ email: 'not an e-mail address', role: 'not a role' });
  });

  it("takes zod's issues by their first path element", () => {
    const parsed = z.object({ email: z.email(), name: z.string().min(1, 'say who you are') }).safeParse({ email: 'x', name: '' });
    expect(parsed.success).toBe(false);
    const errors = fieldErrors(parsed.error);
    expect(Object.keys(errors).sort()).toEqual(['email', 'name']);
    expect(errors.name).toBe('say who you are');
  });

  it('gives nothing for an error without fields (a network failure)', () => {
    expect(fieldErrors(new ApiError(0, 'network', 'no connection to the server'))).toEqual({});
    expect(fieldErrors(new Error('boom'))).toEqual({});
  });
});
