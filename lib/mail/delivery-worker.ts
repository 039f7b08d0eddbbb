// The entry of the mail delivery thread: renders and hands over the batches the request thread
// sends it, so neither rendering nor building MIME messages takes time from requests.
import { parentPort } from 'node:worker_threads';
import { deliverBatch, type BatchMessage, type RelaySettings } from './deliver-batch';

export type DeliveryRequest = { requestId: number; messages: BatchMessage[]; relay: RelaySettings };

parentPort?.on('message', async ({ requestId, messages, relay }: DeliveryRequest) => {
  try {
    parentPort!.postMessage({ requestId, outcomes: await deliverBatch(messages, relay) });
  } catch (error) {
    parentPort!.postMessage({ requestId, error: error instanceof Error ? error.message : String(error) });
  }
});
