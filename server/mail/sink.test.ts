// The local SMTP sink and the mailbox page, without a database: a message sent through the
// app's mailer is caught, parsed, and listed newest first with its links clickable.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import express from 'express';
import { startMailSink, type MailSink } from './sink';
import { configureMailer, sendMail } from './mailer';
import { createMailboxRouter, linkify } from './mailbox';

let sink: MailSink;
beforeAll(async () => {
  sink = await startMailSink();
  configureMailer({ host: '127.0.0.1', port: sink.port, secure: false, from: 'Twistlog <no-reply@twistlog.invalid>' });
});
afterAll(() => sink.close());

describe('the mail sink', () => {
  it('catches what the mailer sends, parsed, and waits for what is still on its way', async () => {
    const waiting = sink.waitFor((m) => m.subject === 'Second');
    await sendMail({ to: 'First.Person@Example.test', subject: 'First', text: 'Open https://app.test/invite/abc?x=1&y=<2> now — ünïcode' });
    await sendMail({
      to: 'two@example.test',
      subject: 'Second',
      text: 'plain',
      attachments: [{ filename: 'sheet.pdf', content: Buffer.from('%PDF-1.4'), contentType: 'application/pdf' }],
    });
    const second = await waiting;
    expect(second.attachments).toEqual([{ filename: 'sheet.pdf', contentType: 'application/pdf', size: 8 }]);
    const first = sink.messages.find((m) => m.subject === 'First')!;
    expect(first.to).toEqual(['first.person@example.test']);
    expect(first.from).toContain('no-reply@twistlog.invalid');
    expect(first.text.trim()).toBe('Open https://app.test/invite/abc?x=1&y=<2> now — ünïcode');
    await expect(sink.waitFor((m) => m.subject === 'never', 50)).rejects.toThrow(/no matching e-mail/);
  });

  it('serves the mailbox page newest first, escaped, with links clickable', async () => {
    const app = express().use(createMailboxRouter(sink));
    const server = http.createServer(app);
    await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
    try {
      const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
      const html = await (await fetch(`${base}/dev/mailbox`)).text();
      expect(html.indexOf('Second')).toBeLessThan(html.indexOf('First'));
      expect(html).toContain('<a href="https://app.test/invite/abc?x=1&amp;y=">https://app.test/invite/abc?x=1&amp;y=</a>&lt;2&gt;');
      expect(html).not.toContain('<2>');
      const json = await (await fetch(`${base}/dev/mailbox.json`)).json();
      expect(json[0].subject).toBe('Second');
    } finally {
      await new Promise((r) => server.close(r));
    }
  });

  it('linkifies only http(s) links and escapes the rest', () => {
    expect(linkify('a <b> javascript:alert(1) http://x.test/p "q"')).toBe(
      'a &lt;b&gt; javascript:alert(1) <a href="http://x.test/p">http://x.test/p</a> &quot;q&quot;',
    );
  });
});
