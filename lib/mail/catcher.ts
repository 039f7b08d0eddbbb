import fs from 'node:fs';
import http from 'node:http';
import { randomUUID } from 'node:crypto';
import type { AddressInfo } from 'node:net';
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';

/** A message as the local mail catcher keeps it (development, demo and tests only). */
export type CaughtMessage = {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  subject: string;
  text: string;
  html: string;
  template: string | null;
  attachments: { filename: string; contentType: string; size: number; contentBase64: string }[];
};

export type MailCatcher = {
  smtpPort: number;
  httpPort: number;
  messages: CaughtMessage[];
  close: () => Promise<void>;
};

const MAX_MESSAGES = 2000;

/**
 * An SMTP server that accepts everything on loopback and keeps it, with a small JSON API
 * (`GET /messages`, `GET /messages/:id`, `DELETE /messages`) that the Outbox page and tests read.
 */
export async function startMailCatcher(options: { smtpPort?: number; httpPort?: number; storeFile?: string } = {}): Promise<MailCatcher> {
  const messages: CaughtMessage[] = [];
  if (options.storeFile && fs.existsSync(options.storeFile)) {
    for (const line of fs.readFileSync(options.storeFile, 'utf8').split('\n')) {
      if (line.trim()) messages.push(JSON.parse(line) as CaughtMessage);
    }
  }

  const smtp = new SMTPServer({
    disabledCommands: ['STARTTLS', 'AUTH'],
    // A catcher on loopback has no use for the client's host name, and on a machine without DNS the
    // reverse lookup stalls every connection.
    disableReverseLookup: true,
    authOptional: true,
    logger: false,
    size: 25 * 1024 * 1024,
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((parsed) => {
          const header = parsed.headers.get('x-countersample-template');
          const message: CaughtMessage = {
            id: randomUUID(),
            receivedAt: new Date().toISOString(),
            from: parsed.from?.text ?? session.envelope.mailFrom?.toString() ?? '',
            to: session.envelope.rcptTo.map((r) => r.address),
            subject: parsed.subject ?? '',
            text: parsed.text ?? '',
            html: typeof parsed.html === 'string' ? parsed.html : '',
            template: typeof header === 'string' ? header : null,
            attachments: parsed.attachments.map((a) => ({
              filename: a.filename ?? 'attachment',
              contentType: a.contentType,
              size: a.size,
              contentBase64: a.content.toString('base64'),
            })),
          };
          messages.push(message);
          if (messages.length > MAX_MESSAGES) messages.splice(0, messages.length - MAX_MESSAGES);
          if (options.storeFile) fs.appendFileSync(options.storeFile, `${JSON.stringify(message)}\n`);
          callback();
        })
        .catch((error: Error) => callback(error));
    },
  });

  const api = http.createServer((req, res) => {
    const url = new URL(req.url ?? '/', 'http://localhost');
    const send = (status: number, body: unknown) => {
      res.writeHead(status, { 'content-type': 'application/json' });
      res.end(JSON.stringify(body));
    };
    if (req.method === 'GET' && url.pathname === '/messages') {
      const summaries = [...messages].reverse().map(({ attachments, ...rest }) => ({
        ...rest,
        attachments: attachments.map(({ contentBase64: _omitted, ...meta }) => meta),
      }));
      return send(200, summaries);
    }
    const one = url.pathname.match(/^\/messages\/([0-9a-f-]{36})$/);
    if (req.method === 'GET' && one) {
      const found = messages.find((m) => m.id === one[1]);
      return found ? send(200, found) : send(404, { error: 'not found' });
    }
    if (req.method === 'DELETE' && url.pathname === '/messages') {
      messages.length = 0;
      if (options.storeFile) fs.writeFileSync(options.storeFile, '');
      return send(204, null);
    }
    return send(404, { error: 'not found' });
  });

  await new Promise<void>((resolve, reject) => {
    smtp.once('error', reject);
    smtp.listen(options.smtpPort ?? 1025, '127.0.0.1', () => resolve());
  });
  await new Promise<void>((resolve, reject) => {
    api.once('error', reject);
    api.listen(options.httpPort ?? 1080, '127.0.0.1', () => resolve());
  });

  const smtpAddress = (smtp as unknown as { server: http.Server }).server.address() as AddressInfo;
  return {
    smtpPort: smtpAddress.port,
    httpPort: (api.address() as AddressInfo).port,
    messages,
    close: () =>
      Promise.all([
        new Promise<void>((resolve) => smtp.close(() => resolve())),
        new Promise<void>((resolve) => api.close(() => resolve())),
      ]).then(() => undefined),
  };
}
