// `npm run dev`: `next dev` beside the local mail catcher and the local upload service, with the
// UPLOADTHING_* settings that point the app at it (unless a hosted UPLOADTHING_TOKEN is set).
import { spawn } from 'node:child_process';
import path from 'node:path';

process.env.APP_ENV ??= 'development';
const port = process.env.PORT ?? '3000';
process.env.BETTER_AUTH_URL ??= `http://localhost:${port}`;

const { env } = await import('../lib/env');
const { startLocalServices } = await import('./local-services');

const settings = env();
const services = await startLocalServices(settings);
const closeServices = services.close;

const nextBin = path.join(process.cwd(), 'node_modules', 'next', 'dist', 'bin', 'next');
const server = spawn(process.execPath, [nextBin, 'dev', '-p', port], { stdio: ['ignore', 'inherit', 'inherit'], env: process.env });
const stop = () => {
  server.kill('SIGTERM');
  void closeServices().then(() => process.exit(0));
};
process.on('SIGINT', stop);
process.on('SIGTERM', stop);
server.on('exit', (code) => void closeServices().then(() => process.exit(code ?? 0)));
