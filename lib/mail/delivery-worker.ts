// The entry of the mail delivery thread: renders and hands over the batches the request thread
// sends it, so neither rendering nor building MIME messages takes time from requests.
import fs from 'node:fs';
import os from 'node:os';
import { parentPort } from 'node:worker_threads';
import { deliverBatch, type BatchMessage, type RelaySettings } from './deliver-batch';

// Mail can wait a moment; a request cannot. On Linux a thread has its own niceness, and this one
// takes the lowest, so on a busy machine the request thread comes first. Elsewhere it keeps the default.
try {
  const threadId = Number(fs.readlinkSync('/proc/thread-self').split('/').pop());
  if (Number.isInteger(threadId) && threadId > 0) os.setPriority(threadId, os.constants.priority.PRIORITY_LOW);
} catch {
  // Not Linux, or not allowed: the thread runs at normal priority.
}

export type DeliveryRequest = { requestId: number; messages: BatchMessage[]; relay: RelaySettings };

parentPort?.on('message', async ({ requestId, messages, relay }: DeliveryRequest) => {
  try {
    parentPort!.postMessage({ requestId, outcomes: await deliverBatch(messages, relay) });
  } catch (error) {
    parentPort!.postMessage({ requestId, error: error instanceof Error ? error.message : String(error) });
  }
});
