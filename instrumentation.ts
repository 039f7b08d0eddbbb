export async function register() {
  // Node.js runtime only: migrations run once per server process, never during `next build`.
  if (process.env.NEXT_RUNTIME === 'nodejs') {
    const { migrate } = await import('./db/migrate');
    await migrate();
    // A production server without its signing key would fail only when the first decision is
    // signed; it refuses to start instead.
    const { signingKey } = await import('./lib/decision/signing-key');
    signingKey();
    // `npm run db:backup` asks this process for snapshots of the folder it holds.
    const [{ publishForThisServer }, { env }] = await Promise.all([import('./lib/backup/endpoint'), import('./lib/env')]);
    publishForThisServer(env());
    if (process.env.APP_ENV !== 'test' && process.env.COUNTERSAMPLE_SCHEDULER !== 'off') {
      const { startScheduler } = await import('./lib/jobs/scheduler');
      startScheduler();
    }
  }
}
