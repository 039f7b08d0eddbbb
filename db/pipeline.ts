import { databaseKind } from './client';

type Step = () => PromiseLike<unknown>;
type Answers<S extends readonly Step[]> = { -readonly [K in keyof S]: Awaited<ReturnType<S[K]>> };

/**
 * Runs statements of one transaction that need nothing from each other's answers, and gives their
 * answers in order. The embedded database takes them all at once and runs them in the order they
 * were sent, so a transaction waits once for the lot instead of once for each; that wait is time
 * its locks are held. A PostgreSQL client runs one statement at a time, so there they go one after
 * the other. When one fails, the error is the first failure in order: a later statement of the
 * same transaction then only fails because the transaction is aborted.
 */
export async function pipelined<const S extends readonly Step[]>(steps: S): Promise<Answers<S>> {
  if (databaseKind() === 'postgres') {
    const answers: unknown[] = [];
    for (const step of steps) answers.push(await step());
    return answers as Answers<S>;
  }
  // A query builder runs when its `then` is called: call it now, so each goes out in its turn
  // rather than in a later microtask behind a step that started straight away.
  const started = steps.map(
    (step) =>
      new Promise<unknown>((resolve, reject) => {
        step().then(resolve, reject);
      }),
  );
  const settled = await Promise.allSettled(started);
  const failed = settled.find((s): s is PromiseRejectedResult => s.status === 'rejected');
  if (failed) throw failed.reason;
  return settled.map((s) => (s as PromiseFulfilledResult<unknown>).value) as Answers<S>;
}
