// The development mailbox: every message the local sink caught, newest first, as one plain
// HTML page (links clickable) and as JSON. It exists only in development and tests, and answers
// only requests addressed to this server by a loopback name (or the configured public URL's host),
// so a page elsewhere cannot read it through DNS rebinding.
import { createHash } from 'node:crypto';
import { Router, type RequestHandler } from 'express';
import type { CaughtMessage, MailboxSource } from './sink';
import { publicAppUrl } from './templates';

const escapeHtml = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');

/** Escape a text body and make its http(s) links clickable. */
export function linkify(text: string): string {
  const parts = text.split(/(https?:\/\/[^\s<>"']+)/g);
  return parts.map((p, i) => (i % 2 === 1 ? `<a href="${escapeHtml(p)}">${escapeHtml(p)}</a>` : escapeHtml(p))).join('');
}

let mountedAt: string | undefined;
/** Where the development mailbox is served, when it is (sign-up answers name it for newcomers). */
export const devMailboxPath = () => mountedAt;

const LOOPBACK_NAMES = ['127.0.0.1', 'localhost', '[::1]'];

/** The Host must name this server: a loopback name with the port the request came in on, or PUBLIC_URL's host. */
const ownHostOnly: RequestHandler = (req, res, next) => {
  const host = (req.headers.host ?? '').toLowerCase();
  const allowed = [...LOOPBACK_NAMES.map((n) => `${n}:${req.socket.localPort}`), new URL(publicAppUrl()).host.toLowerCase()];
  if (allowed.includes(host)) return next();
  res.status(403).type('text').send('The development mailbox answers only on this machine (127.0.0.1 or localhost).');
};

const STYLE = `
  body { font-family: system-ui, sans-serif; margin: 0 auto; max-width: 48rem; padding: 1rem; background: #f4f1e8; color: #0d1b1e; font-size: 18px; }
  ol { list-style: none; padding: 0; }
  li { background: #fff; border: 2px solid #c9c3b3; border-radius: 12px; padding: 0.75rem 1rem; margin: 0 0 1rem; }
  h2 { margin: 0 0 0.25rem; font-size: 1.2rem; }
  .meta { margin: 0 0 0.5rem; font-size: 0.9rem; color: #10333d; }
  pre { white-space: pre-wrap; word-break: break-word; font-family: inherit; margin: 0; }
  a { color: #10333d; font-weight: bold; display: inline-block; padding: 0.4rem 0; }
`;
/** The page's one style block, allowed by its hash: the policy keeps refusing every other inline style and all scripts. */
const PAGE_CSP = `default-src 'none'; style-src 'sha256-${createHash('sha256').update(STYLE).digest('base64')}'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'`;

/** `source`: the sink in this process (tests) or the one every instance shares (remoteMailbox). */
export function createMailboxRouter(source: MailboxSource, nodeEnv = process.env.NODE_ENV): Router {
  if (nodeEnv !== 'development' && nodeEnv !== 'test') {
    throw new Error(`the mailbox is served only in development and tests (NODE_ENV is ${nodeEnv ?? 'unset'})`);
  }
  mountedAt = '/dev/mailbox';
  const r = Router();
  r.use('/dev/mailbox', ownHostOnly);
  r.use('/dev/mailbox.json', ownHostOnly);
  const newestFirst = async () => [...(await source.list())].reverse();

  r.get('/dev/mailbox.json', async (_req, res) => {
    res.setHeader('Cache-Control', 'no-store');
    res.json(await newestFirst());
  });

  r.get('/dev/mailbox', async (_req, res) => {
    const messages = await newestFirst();
    const items = messages
      .map(
        (m) => `<li id="message-${m.seq}">
  <h2>${escapeHtml(m.subject || '(no subject)')}</h2>
  <p class="meta">To: <span class="to">${escapeHtml(m.to.join(', '))}</span> · <time datetime="${m.receivedAt.toISOString()}">${escapeHtml(m.receivedAt.toISOString().replace('T', ' ').slice(0, 19))} UTC</time>${m.attachments.length ? ` · ${m.attachments.length} attachment(s): ${escapeHtml(m.attachments.map((a) => a.filename).join(', '))}` : ''}</p>
  <pre>${linkify(m.text)}</pre>
</li>`,
      )
      .join('\n');
    res.setHeader('Cache-Control', 'no-store');
    res.setHeader('Content-Security-Policy', PAGE_CSP);
    res.type('html').send(`<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>Mailbox (development) · Twistlog</title>
<style>${STYLE}</style>
</head>
<body>
<h1>Mailbox</h1>
<p>Every e-mail the app sent while running here, newest first. Nothing was delivered to anyone: the development mail sink keeps it. (${messages.length} message${messages.length === 1 ? '' : 's'}; reload to see new ones.)</p>
<ol>
${items || '<li>No e-mail yet.</li>'}
</ol>
</body>
</html>`);
  });
  return r;
}

/** The messages of a sink running in another process (its `listUrl`). */
export function remoteMailbox(listUrl: string): MailboxSource {
  return {
    async list() {
      const res = await fetch(listUrl);
      if (!res.ok) throw new Error(`the mail sink at ${listUrl} answered ${res.status}`);
      const caught = (await res.json()) as (Omit<CaughtMessage, 'receivedAt'> & { receivedAt: string })[];
      return caught.map((m) => ({ ...m, receivedAt: new Date(m.receivedAt) }));
    },
  };
}
