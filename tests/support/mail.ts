// E-mail in tests: what the test server's SMTP sink caught (ts.mail), and the links in it.
import type { CaughtMessage } from '../../server/mail/sink';
import type { TestServer } from './test-app';

export type { CaughtMessage };

/** Wait for an e-mail to `to` (and whose subject matches, when given). */
export function waitForMail(ts: TestServer, to: string, subject?: RegExp, timeoutMs = 10_000): Promise<CaughtMessage> {
  const addr = to.toLowerCase();
  return ts.mail.waitFor((m) => m.to.includes(addr) && (!subject || subject.test(m.subject)), timeoutMs);
}

/** Every message caught so far for `to`. */
export const mailTo = (ts: TestServer, to: string) => ts.mail.messages.filter((m) => m.to.includes(to.toLowerCase()));

/** The http(s) links in a message's text body. */
export const linksIn = (m: CaughtMessage) => m.text.match(/https?:\/\/[^\s<>"']+/g) ?? [];

/** The one link whose path starts with `pathPrefix` (e.g. '/invite/'). */
export function linkIn(m: CaughtMessage, pathPrefix: string): URL {
  const found = linksIn(m)
    .map((l) => new URL(l))
    .filter((u) => u.pathname.startsWith(pathPrefix));
  if (found.length !== 1) throw new Error(`expected one ${pathPrefix}… link in "${m.subject}", found ${found.length}:\n${m.text}`);
  return found[0];
}

/** The token at the end of such a link. */
export const tokenIn = (m: CaughtMessage, pathPrefix: string) => linkIn(m, pathPrefix).pathname.slice(pathPrefix.length);
