import { fork, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { SMTPServer } from 'smtp-server';

export type MailSink = { smtpPort: number; httpPort: number; received: () => Promise<number>; close: () => Promise<void> };

/**
 * The bench's mail relay: accepts every message and counts it, without parsing, in a process of
 * its own. In the bench's process it would share an event loop with the clients that time the
 * requests, and every notice the server hands over would delay them and be charged to the server.
 * No HTTP side: the server is given a port nothing listens on, and the Outbox page is not measured.
 */
export async function startMailSink(): Promise<MailSink> {
  const child: ChildProcess = fork(fileURLToPath(import.meta.url), ['--serve'], { execArgv: ['--import', 'tsx'], stdio: ['ignore', 'inherit', 'inherit', 'ipc'] });
  // One question at a time is in flight (the bench asks in turn), so a reply answers the oldest.
  const waiting: { resolve: (value: number) => void; reject: (error: Error) => void }[] = [];
  child.on('message', (value: number) => waiting.shift()?.resolve(value));
  child.once('exit', (code) => {
    for (const w of waiting.splice(0)) w.reject(new Error(`The mail sink stopped (exit code ${code}).`));
  });
  const ask = (question: 'port' | 'count') =>
    new Promise<number>((resolve, reject) => {
      waiting.push({ resolve, reject });
      child.send(question);
    });
  const smtpPort = await ask('port');
  return {
    smtpPort,
    httpPort: 9,
    received: () => ask('count'),
    close: async () => {
      child.kill();
    },
  };
}

async function serve() {
  let received = 0;
  const smtp = new SMTPServer({
    disabledCommands: ['STARTTLS', 'AUTH'],
    disableReverseLookup: true,
    authOptional: true,
    logger: false,
    onData(stream, _session, callback) {
      stream.on('end', () => {
        received++;
        callback();
      });
      stream.resume();
    },
  });
  await new Promise<void>((resolve) => smtp.listen(0, '127.0.0.1', resolve));
  const address = smtp.server.address();
  if (!address || typeof address === 'string') throw new Error('The mail sink did not get a port.');
  process.on('message', (question: string) => process.send!(question === 'port' ? address.port : received));
  process.on('disconnect', () => process.exit(0));
}

if (process.argv.includes('--serve')) await serve();
