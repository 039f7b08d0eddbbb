import 'server-only';
import { Worker } from 'node:worker_threads';
import { env } from '@/lib/env';
import { deliverBatch, type BatchMessage, type BatchOutcome, type RelaySettings } from './deliver-batch';
import type { DeliveryRequest } from './delivery-worker';

type Pending = { resolve: (outcomes: BatchOutcome[]) => void; reject: (error: Error) => void };
type ThreadState = { worker: Worker; pending: Map<number, Pending>; nextId: number; idleTimer: NodeJS.Timeout | null };

/** A thread with nothing to do is stopped after this long, so an idle server holds no second heap. */
const IDLE_MS = 10_000;

const globalForThread = globalThis as unknown as { __countersampleDeliveryThread?: ThreadState | null };

function relay(): RelaySettings {
  return { smtpUrl: env().SMTP_URL, from: env().MAIL_FROM };
}

/**
 * Where the thread can run: inside the Next.js server, whose bundler builds the thread's entry as
 * its own chunk. Scripts and tests run the TypeScript sources, where a thread could not load it, so
 * they render in-thread (MAIL_THREAD=off asks for that anywhere).
 */
function threadWanted(): boolean {
  return process.env.NEXT_RUNTIME === 'nodejs' && process.env.MAIL_THREAD !== 'off';
}

function startThread(): ThreadState {
  // Written out in full here: the bundler finds the thread's entry by this very expression.
  const worker = new Worker(new URL('./delivery-worker.ts', import.meta.url));
  const state: ThreadState = { worker, pending: new Map(), nextId: 1, idleTimer: null };
  const failAll = (error: Error) => {
    for (const { reject } of state.pending.values()) reject(error);
    state.pending.clear();
    if (globalForThread.__countersampleDeliveryThread === state) globalForThread.__countersampleDeliveryThread = null;
  };
  worker.on('message', (reply: { requestId: number; outcomes?: BatchOutcome[]; error?: string }) => {
    const pending = state.pending.get(reply.requestId);
    if (!pending) return;
    state.pending.delete(reply.requestId);
    if (reply.outcomes) pending.resolve(reply.outcomes);
    else pending.reject(new Error(reply.error ?? 'The mail thread gave no answer.'));
    if (state.pending.size === 0) armIdleTimer(state);
  });
  worker.on('error', failAll);
  worker.on('exit', (code) => failAll(new Error(`The mail thread stopped (exit code ${code}).`)));
  // The thread never keeps the process alive on its own: shutdown does not wait for it.
  worker.unref();
  return state;
}

function armIdleTimer(state: ThreadState) {
  if (state.idleTimer) clearTimeout(state.idleTimer);
  state.idleTimer = setTimeout(() => {
    if (state.pending.size > 0) return;
    if (globalForThread.__countersampleDeliveryThread === state) globalForThread.__countersampleDeliveryThread = null;
    void state.worker.terminate();
  }, IDLE_MS);
  state.idleTimer.unref();
}

/**
 * Renders and hands over one batch on the mail thread, started on first use and stopped when idle;
 * in-thread where no thread can run. Rejects only when the thread itself failed: the messages then
 * stay claimed, and the worker's stale-claim rule takes them again.
 */
export function deliverBatchOffThread(messages: BatchMessage[]): Promise<BatchOutcome[]> {
  if (!threadWanted()) return deliverBatch(messages, relay());
  let state = globalForThread.__countersampleDeliveryThread;
  if (!state) state = globalForThread.__countersampleDeliveryThread = startThread();
  if (state.idleTimer) clearTimeout(state.idleTimer);
  const requestId = state.nextId++;
  const request: DeliveryRequest = { requestId, messages, relay: relay() };
  const running = state;
  return new Promise<BatchOutcome[]>((resolve, reject) => {
    running.pending.set(requestId, { resolve, reject });
    running.worker.postMessage(request);
  });
}
