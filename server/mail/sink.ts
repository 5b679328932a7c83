// A local SMTP sink for development and tests: accepts every message on loopback, keeps it in
// memory (parsed), and never relays anything. `npm start` runs one in a process of its own
// (server/scripts/local-services.ts) that every app instance sends to, and which lists what it
// caught as JSON on a loopback HTTP port; tests start one per test server. The mailbox page
// (mailbox.ts) lists what it caught.
import http from 'node:http';
import { SMTPServer } from 'smtp-server';
import { simpleParser, type AddressObject } from 'mailparser';
import type { AddressInfo } from 'node:net';

export interface CaughtMessage {
  /** 1, 2, 3… in the order the sink received them. */
  seq: number;
  receivedAt: Date;
  /** Envelope recipients (RCPT TO), lower-case. */
  to: string[];
  from: string;
  subject: string;
  text: string;
  html: string | null;
  attachments: { filename: string; contentType: string; size: number }[];
}

/** Where the development mailbox reads caught messages from. */
export interface MailboxSource {
  /** Every message caught so far, oldest first. */
  list(): Promise<readonly CaughtMessage[]>;
}

export interface MailSink extends MailboxSource {
  host: string;
  port: number;
  /** The loopback URL listing the messages as JSON, when started with `httpPort`. */
  listUrl?: string;
  /** Every message caught so far, oldest first. */
  readonly messages: readonly CaughtMessage[];
  clear(): void;
  /** Resolves with the first message (caught already or later) that matches; rejects after timeoutMs. */
  waitFor(match: (m: CaughtMessage) => boolean, timeoutMs?: number): Promise<CaughtMessage>;
  close(): Promise<void>;
}

const addressText = (a: AddressObject | AddressObject[] | undefined) => (Array.isArray(a) ? a : a ? [a] : []).map((x) => x.text).join(', ');

export async function startMailSink(opts: { port?: number; host?: string; httpPort?: number } = {}): Promise<MailSink> {
  const host = opts.host ?? '127.0.0.1';
  const messages: CaughtMessage[] = [];
  const waiters = new Set<{ match: (m: CaughtMessage) => boolean; resolve: (m: CaughtMessage) => void }>();
  let seq = 0;

  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    banner: 'Twistlog mail sink: nothing is relayed',
    size: 25 * 1024 * 1024,
    logger: false,
    onAuth(_auth, _session, callback) {
      callback(null, { user: 'sink' });
    },
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const m: CaughtMessage = {
            seq: ++seq,
            receivedAt: new Date(),
            to: session.envelope.rcptTo.map((r) => r.address.toLowerCase()),
            from: addressText(parsed.from) || (session.envelope.mailFrom ? session.envelope.mailFrom.address : ''),
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            html: typeof parsed.html === 'string' ? parsed.html : null,
            attachments: parsed.attachments.map((a) => ({ filename: a.filename ?? '', contentType: a.contentType, size: a.size })),
          };
          messages.push(m);
          for (const w of [...waiters]) {
            if (w.match(m)) {
              waiters.delete(w);
              w.resolve(m);
            }
          }
          callback();
        })
        .catch((err: Error) => callback(err));
    },
  });

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(opts.port ?? 0, host, () => {
      server.off('error', reject);
      resolve();
    });
  });
  // Keep serving after a client misbehaves.
  server.on('error', () => {});
  const port = (server as unknown as { server: { address(): AddressInfo } }).server.address().port;

  // Other processes (every app instance's mailbox page) read the list here.
  let lister: http.Server | undefined;
  if (opts.httpPort !== undefined) {
    lister = http.createServer((_req, res) => {
      res.writeHead(200, { 'Content-Type': 'application/json', 'Cache-Control': 'no-store' });
      res.end(JSON.stringify(messages));
    });
    await new Promise<void>((resolve) => lister!.listen(opts.httpPort, host, () => resolve()));
  }

  return {
    host,
    port,
    listUrl: lister ? `http://${host}:${(lister.address() as AddressInfo).port}/messages` : undefined,
    messages,
    list: async () => messages,
    clear() {
      messages.length = 0;
    },
    waitFor(match, timeoutMs = 10_000) {
      const found = messages.find(match);
      if (found) return Promise.resolve(found);
      return new Promise((resolve, reject) => {
        const w = { match, resolve: (m: CaughtMessage) => (clearTimeout(timer), resolve(m)) };
        const timer = setTimeout(() => {
          waiters.delete(w);
          reject(
            new Error(
              `no matching e-mail reached the sink within ${timeoutMs} ms (caught: ${messages.map((x) => `"${x.subject}" to ${x.to.join(',')}`).join('; ') || 'none'})`,
            ),
          );
        }, timeoutMs);
        waiters.add(w);
      });
    },
    close: async () => {
      lister?.closeAllConnections();
      await new Promise<void>((resolve) => (lister ? lister.close(() => resolve()) : resolve()));
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}
