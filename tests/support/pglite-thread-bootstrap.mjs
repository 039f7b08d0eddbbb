// Runs the database thread's TypeScript entry in a worker: the server's bundler builds it there,
// tests load it through tsx instead.
import { register } from 'tsx/esm/api';

register();
await import('../../db/thread/pglite-thread.ts');
