// The part of negotiator's API that answer-cache.ts uses (the package ships no types).
declare module 'negotiator' {
  import type { IncomingMessage } from 'node:http';

  export default class Negotiator {
    constructor(request: IncomingMessage);
    /** The best of `available` for the request's Accept-Encoding; ties go to the first of `preferred`. */
    encoding(available: string[], options?: { preferred?: string[] }): string | undefined;
  }
}
