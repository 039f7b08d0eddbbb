import fs from 'node:fs';
import path from 'node:path';
import { startMailCatcher } from './catcher';

const smtpPort = Number(process.env.MAIL_CATCHER_SMTP_PORT ?? 1025);
const httpPort = Number(process.env.MAIL_CATCHER_HTTP_PORT ?? 1080);
const storeFile = path.join(process.cwd(), 'data', 'caught-mail.jsonl');
fs.mkdirSync(path.dirname(storeFile), { recursive: true });

const catcher = await startMailCatcher({ smtpPort, httpPort, storeFile });
console.log(`Mail catcher: SMTP on 127.0.0.1:${catcher.smtpPort}, messages at http://127.0.0.1:${catcher.httpPort}/messages`);
const stop = () => void catcher.close().then(() => process.exit(0));
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
