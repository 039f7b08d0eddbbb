import fs from 'node:fs';
import http from 'node:http';
import autocannon from 'autocannon';

export function percentile(sortedMs: number[], p: number): number {
  if (sortedMs.length === 0) return Number.NaN;
  const index = Math.min(sortedMs.length - 1, Math.max(0, Math.ceil((p / 100) * sortedMs.length) - 1));
  return sortedMs[index];
}

export type Latency = { n: number; p50: number; p95: number; errors: number };

export function summarise(samplesMs: number[], errors = 0): Latency {
  const sorted = [...samplesMs].sort((a, b) => a - b);
  return { n: sorted.length, p50: percentile(sorted, 50), p95: percentile(sorted, 95), errors };
}

const agent = new http.Agent({ keepAlive: true, maxSockets: 1 });

/** One GET on a kept-alive loopback connection; the time runs until the last byte of the body. */
export function timedGet(url: string, headers: Record<string, string>): Promise<{ status: number; ms: number; bytes: number }> {
  return new Promise((resolve, reject) => {
    const started = performance.now();
    const request = http.get(url, { agent, headers }, (response) => {
      let bytes = 0;
      response.on('data', (chunk: Buffer) => (bytes += chunk.length));
      response.on('end', () => resolve({ status: response.statusCode ?? 0, ms: performance.now() - started, bytes }));
      response.on('error', reject);
    });
    request.on('error', reject);
  });
}

/** Requests one after another (one connection): warm-up first, then the measured ones. */
export async function sequentialLatency(urls: () => string, headers: Record<string, string>, options: { warmup: number; requests: number }): Promise<Latency> {
  for (let i = 0; i < options.warmup; i++) await timedGet(urls(), headers);
  const samples: number[] = [];
  let errors = 0;
  for (let i = 0; i < options.requests; i++) {
    const { status, ms } = await timedGet(urls(), headers);
    if (status < 200 || status > 299) errors++;
    samples.push(ms);
  }
  return summarise(samples, errors);
}

/** Resident memory of a process and all its descendants, in MB, from /proc. */
export function treeRssMb(rootPid: number): number {
  const children = new Map<number, number[]>();
  for (const entry of fs.readdirSync('/proc')) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = fs.readFileSync(`/proc/${entry}/stat`, 'utf8');
      // The command name may hold spaces and parentheses; the fields after its closing one are fixed.
      const ppid = Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[1]);
      const list = children.get(ppid) ?? [];
      list.push(Number(entry));
      children.set(ppid, list);
    } catch {
      // The process ended while we looked.
    }
  }
  let kb = 0;
  const visit = (pid: number) => {
    try {
      const match = /VmRSS:\s+(\d+) kB/.exec(fs.readFileSync(`/proc/${pid}/status`, 'utf8'));
      if (match) kb += Number(match[1]);
    } catch {
      return;
    }
    for (const child of children.get(pid) ?? []) visit(child);
  };
  visit(rootPid);
  return kb / 1024;
}

/** Samples the tree's RSS every 250 ms until stopped; returns the peak. */
export function sampleRss(rootPid: number): { stop: () => number } {
  let peak = treeRssMb(rootPid);
  const timer = setInterval(() => (peak = Math.max(peak, treeRssMb(rootPid))), 250);
  return {
    stop: () => {
      clearInterval(timer);
      return Math.max(peak, treeRssMb(rootPid));
    },
  };
}

export type LoadRequest = { path: string; headers: Record<string, string>; label: string };
export type LoadResult = { requests: number; rps: number; p50: number; p99: number; errors: number; non2xx: number; timeouts: number };

/** A fixed number of clients, each cycling through the request mix, for a duration. */
export async function runLoad(baseUrl: string, mix: LoadRequest[], options: { connections: number; seconds: number }): Promise<LoadResult> {
  const result = await autocannon({
    url: baseUrl,
    connections: options.connections,
    duration: options.seconds,
    timeout: 10,
    requests: mix.map((r) => ({ method: 'GET', path: r.path, headers: r.headers })),
  });
  return {
    requests: result.requests.total,
    rps: result.requests.average,
    p50: result.latency.p50,
    p99: result.latency.p99,
    // autocannon counts timeouts among its errors; a non-2xx answer counts as an error here too.
    errors: result.errors + result.non2xx,
    non2xx: result.non2xx,
    timeouts: result.timeouts,
  };
}
