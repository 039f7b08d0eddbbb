import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { gzipSync } from 'node:zlib';
import { chromium } from 'playwright-core';
import { percentile } from './measure';

const CHROMIUM = process.env.CHROMIUM_PATH || '/usr/bin/chromium';
const ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run', '--disable-quic'];

export type PageLoadFigures = {
  lcpMs: number;
  lcpSamplesMs: number[];
  /** Sum of the gzip sizes of the JavaScript files the page loaded, each gzipped here at level 9. */
  jsGzipBytes: number;
  jsRawBytes: number;
  jsFiles: number;
};

/**
 * Loads one page several times, each in a fresh browser context (cold cache, as a first visit),
 * and reads its Largest Contentful Paint; the first load's script responses are recorded and gzipped.
 */
export async function measurePageLoad(url: string, cookieHeader: string, loads: number): Promise<PageLoadFigures> {
  const userDataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'countersample-bench-chromium-'));
  const browser = await chromium.launch({ executablePath: CHROMIUM, headless: true, args: ARGS });
  const { hostname } = new URL(url);
  const cookies = cookieHeader.split('; ').map((pair) => {
    const at = pair.indexOf('=');
    return { name: pair.slice(0, at), value: pair.slice(at + 1), domain: hostname, path: '/', httpOnly: true, sameSite: 'Lax' as const };
  });
  const lcpSamplesMs: number[] = [];
  let jsRawBytes = 0;
  let jsGzipBytes = 0;
  let jsFiles = 0;
  try {
    for (let i = 0; i < loads; i++) {
      const context = await browser.newContext({ viewport: { width: 1280, height: 900 }, locale: 'en-GB', timezoneId: 'Europe/London' });
      await context.addCookies(cookies);
      const page = await context.newPage();
      const scripts: Promise<void>[] = [];
      if (i === 0) {
        page.on('response', (response) => {
          if (response.request().resourceType() !== 'script') return;
          scripts.push(
            response.body().then(
              (body) => {
                jsFiles++;
                jsRawBytes += body.length;
                jsGzipBytes += gzipSync(body, { level: 9 }).length;
              },
              () => undefined,
            ),
          );
        });
      }
      const response = await page.goto(url, { waitUntil: 'load', timeout: 30_000 });
      if (!response || response.status() !== 200) throw new Error(`${url} answered ${response?.status()} in the browser`);
      await page.waitForLoadState('networkidle', { timeout: 15_000 }).catch(() => undefined);
      const lcp = await page.evaluate(
        () =>
          new Promise<number | null>((resolve) => {
            new PerformanceObserver((list) => {
              const entries = list.getEntries();
              resolve(entries.length ? entries[entries.length - 1].startTime : null);
            }).observe({ type: 'largest-contentful-paint', buffered: true });
            setTimeout(() => resolve(null), 3000);
          }),
      );
      await Promise.all(scripts);
      if (lcp !== null) lcpSamplesMs.push(lcp);
      await context.close();
    }
  } finally {
    await browser.close();
    fs.rmSync(userDataDir, { recursive: true, force: true });
  }
  const sorted = [...lcpSamplesMs].sort((a, b) => a - b);
  return { lcpMs: percentile(sorted, 50), lcpSamplesMs, jsGzipBytes, jsRawBytes, jsFiles };
}
