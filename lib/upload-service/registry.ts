// What the app registered for its uploads (`POST /route-metadata`) and the answers it owes:
// the `serverData` of each completed upload, reported through `POST /callback-result`.
import type { ServerResponse } from 'node:http';

export type Registration = {
  fileKeys: string[];
  metadata: unknown;
  isDev: boolean;
  callbackUrl: string;
  callbackSlug: string;
  awaitServerData: boolean;
  expiresAtMs: number;
  /** Dev mode: the open NDJSON answer of the registration, which carries the hooks to the app. */
  devStream: ServerResponse | null;
  pending: Set<string>;
};

export type HookLine = { payload: string; signature: string; hook: 'callback' | 'error' };

type Waiter<T> = { resolve: (value: T) => void; reject: (error: Error) => void; timer: NodeJS.Timeout };

export class CallbackTimeout extends Error {}

export class UploadRegistry {
  private readonly byKey = new Map<string, Registration>();
  private readonly registrationWaiters = new Map<string, Waiter<Registration | null>[]>();
  private readonly resultWaiters = new Map<string, Waiter<unknown>>();

  register(registration: Registration): void {
    for (const key of registration.fileKeys) {
      this.byKey.set(key, registration);
      for (const waiter of this.registrationWaiters.get(key) ?? []) {
        clearTimeout(waiter.timer);
        waiter.resolve(registration);
      }
      this.registrationWaiters.delete(key);
    }
    const ttl = Math.max(0, registration.expiresAtMs - Date.now());
    setTimeout(() => this.expire(registration), ttl).unref();
  }

  /**
   * In dev mode the SDK registers after it has answered the browser, so an upload can finish first;
   * it waits for the registration a while instead of skipping the callback.
   */
  registrationFor(key: string, waitMs: number): Promise<Registration | null> {
    const found = this.byKey.get(key);
    if (found || waitMs <= 0) return Promise.resolve(found ?? null);
    return new Promise((resolve, reject) => {
      const waiters = this.registrationWaiters.get(key) ?? [];
      const waiter: Waiter<Registration | null> = {
        resolve,
        reject,
        timer: setTimeout(() => {
          this.registrationWaiters.set(key, (this.registrationWaiters.get(key) ?? []).filter((w) => w !== waiter));
          resolve(null);
        }, waitMs),
      };
      waiters.push(waiter);
      this.registrationWaiters.set(key, waiters);
    });
  }

  /** Starts waiting for the app's `callback-result` for a key; call before sending the hook. */
  expectResult(key: string, timeoutMs: number): Promise<unknown> {
    this.resultWaiters.get(key)?.reject(new Error('superseded'));
    return new Promise((resolve, reject) => {
      const timer = setTimeout(() => {
        this.resultWaiters.delete(key);
        reject(new CallbackTimeout(`The app did not report a result for ${key} within ${timeoutMs} ms`));
      }, timeoutMs);
      this.resultWaiters.set(key, { resolve, reject, timer });
    });
  }

  /** The app's answer; false when nobody is waiting for that key. */
  settleResult(key: string, outcome: { callbackData: unknown } | { error: string }): boolean {
    const waiter = this.resultWaiters.get(key);
    if (!waiter) return false;
    this.resultWaiters.delete(key);
    clearTimeout(waiter.timer);
    if ('error' in outcome) waiter.reject(new Error(outcome.error));
    else waiter.resolve(outcome.callbackData);
    return true;
  }

  sendDevHook(registration: Registration, line: HookLine): boolean {
    const stream = registration.devStream;
    if (!stream || stream.writableEnded || stream.destroyed) return false;
    stream.write(`${JSON.stringify(line)}\n`);
    return true;
  }

  /** Marks a key finished; the dev stream ends once every file of its registration is. */
  finish(key: string): void {
    const registration = this.byKey.get(key);
    if (!registration) return;
    this.byKey.delete(key);
    registration.pending.delete(key);
    if (registration.pending.size === 0) registration.devStream?.end();
  }

  private expire(registration: Registration): void {
    for (const key of registration.fileKeys) if (this.byKey.get(key) === registration) this.byKey.delete(key);
    registration.devStream?.end();
  }

  close(): void {
    for (const registration of new Set(this.byKey.values())) registration.devStream?.end();
    this.byKey.clear();
    for (const waiters of this.registrationWaiters.values()) for (const w of waiters) {
      clearTimeout(w.timer);
      w.resolve(null);
    }
    this.registrationWaiters.clear();
    for (const w of this.resultWaiters.values()) {
      clearTimeout(w.timer);
      w.reject(new Error('The upload service is closing'));
    }
    this.resultWaiters.clear();
  }
}
