// zod's fast path compiles parsers with new Function(), which the app's Content-Security-Policy
// forbids (no 'unsafe-eval', server/http/security-headers.ts): parse without it, and without even
// probing for it (the probe alone is reported as a violation). Imported first by main.tsx.
import * as z from 'zod';

z.config({ jitless: true });
