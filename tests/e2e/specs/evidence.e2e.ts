import { createHash } from 'node:crypto';
import fs from 'node:fs';
import { afterAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openBrowser, screenshot, useSession, waitForHydration, type BrowserSession } from '../support/browser';
import { fixtures } from '../support/fixtures';
import { minimalPdf, sampleImage } from '../../unit/evidence/samples';

// Evidence through the real upload SDK and the local upload service: the referee laboratory adds a
// lab sheet and a photo to a case of supplier2@, who sees both in the gallery and downloads them;
// the SHA-256 the page shows is the SHA-256 of the downloaded bytes. The steps build on each other.

const browsers: BrowserSession[] = [];
const sha256 = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');
const flow: { caseId?: string; pdf?: Buffer; photo?: Buffer } = {};
const CAPTION = 'Retest sheet of the retained sample, bench 2';

afterAll(async () => {
  for (const b of browsers) await b.close().catch(() => undefined);
});

async function asParty(key: string, address: string): Promise<Page> {
  const browser = await openBrowser();
  browsers.push(browser);
  await useSession(browser.context, fixtures().cookies[key]);
  const page = await browser.context.newPage();
  await page.goto(address);
  return page;
}

async function caseIds(key: string): Promise<{ id: string; status: string }[]> {
  const response = await fetch(`${fixtures().baseUrl}/api/v1/cases?pageSize=100`, { headers: { cookie: fixtures().cookies[key] } });
  expect(response.status).toBe(200);
  return ((await response.json()) as { items: { id: string; status: string }[] }).items;
}

/** A live case of supplier2@ that is with the referee laboratory. */
async function sharedLiveCase(): Promise<string> {
  const [atLab, ofSupplier] = await Promise.all([caseIds('lab'), caseIds('supplier2')]);
  const supplierIds = new Set(ofSupplier.map((c) => c.id));
  const live = atLab.filter((c) => supplierIds.has(c.id) && ['awaiting_sample', 'retest', 'review'].includes(c.status));
  const chosen = live.find((c) => c.status === 'retest') ?? live[0];
  if (!chosen) throw new Error('No live case shared by the laboratory and supplier2@');
  return chosen.id;
}

async function uploadAs(page: Page, kindLabel: string, file: { name: string; mimeType: string; buffer: Buffer }, caption?: string): Promise<void> {
  const uploader = page.getByTestId('evidence-uploader');
  await uploader.getByLabel('Kind of evidence').selectOption({ label: kindLabel });
  if (caption) await uploader.getByLabel('Caption (optional)').fill(caption);
  // The SDK's button is ready once it has read the route's limits.
  await uploader.locator('[data-ut-element="button"][data-state="ready"]').waitFor();
  await uploader.locator('input[type="file"]').setInputFiles(file);
  await uploader.getByRole('status').filter({ hasText: `Added to the case: ${file.name}.` }).waitFor({ timeout: 30_000 });
}

/** The page carries an "Add evidence" button, not the upload SDK: a click loads the uploader and focuses its first field. */
async function openUploader(page: Page): Promise<void> {
  await waitForHydration(page, '[data-testid="add-evidence"]');
  expect(await page.getByTestId('evidence-uploader').count()).toBe(0);
  await page.getByRole('button', { name: 'Add evidence' }).click();
  const kind = page.getByTestId('evidence-uploader').getByLabel('Kind of evidence');
  await kind.waitFor();
  await expect.poll(() => kind.evaluate((el) => el === document.activeElement)).toBe(true);
}

function galleryItem(page: Page, fileName: string) {
  return page.getByTestId('evidence-gallery').locator('li').filter({ hasText: fileName });
}

describe('evidence on the case file', () => {
  it('lab@ uploads a PDF lab sheet and a photo; the page says what was added', { timeout: 120_000 }, async () => {
    flow.caseId = await sharedLiveCase();
    flow.pdf = minimalPdf();
    flow.photo = await sampleImage('jpeg', 1280, 960);
    const page = await asParty('lab', `/cases/${flow.caseId}`);
    await openUploader(page);

    await uploadAs(page, 'Lab sheet', { name: 'retest-sheet.pdf', mimeType: 'application/pdf', buffer: flow.pdf }, CAPTION);
    await uploadAs(page, 'Photo', { name: 'seal-at-receipt.jpg', mimeType: 'image/jpeg', buffer: flow.photo });
    await galleryItem(page, 'seal-at-receipt.jpg').waitFor();
    expect(await galleryItem(page, 'retest-sheet.pdf').innerText()).toContain(CAPTION);
    await screenshot(page, 'evidence-1-lab-uploaded');
  });

  it('lab@ is told in words when a file is not what its name says, and nothing is added', { timeout: 60_000 }, async () => {
    const page = await asParty('lab', `/cases/${flow.caseId}`);
    await openUploader(page);
    const before = await page.getByTestId('evidence-gallery').locator('li').count();
    const uploader = page.getByTestId('evidence-uploader');
    await uploader.getByLabel('Kind of evidence').selectOption({ label: 'Lab sheet' });
    await uploader.locator('[data-ut-element="button"][data-state="ready"]').waitFor();
    await uploader.locator('input[type="file"]').setInputFiles({ name: 'not-a-sheet.pdf', mimeType: 'application/pdf', buffer: flow.photo! });
    const alert = uploader.getByRole('alert').filter({ hasText: 'not-a-sheet.pdf was not added.' });
    await alert.waitFor({ timeout: 30_000 });
    expect(await alert.innerText()).toContain('named .pdf but its content is JPEG');
    await page.reload();
    expect(await page.getByTestId('evidence-gallery').locator('li').count()).toBe(before);
  });

  it('supplier2@ sees both with previews and downloads them; each SHA-256 shown is that of the downloaded file', { timeout: 90_000 }, async () => {
    const page = await asParty('supplier2', `/cases/${flow.caseId}`);
    const sheet = galleryItem(page, 'retest-sheet.pdf');
    const photo = galleryItem(page, 'seal-at-receipt.jpg');
    await sheet.waitFor();
    expect(await sheet.innerText()).toContain('Eskmere Regional Dairy Laboratory');
    const preview = photo.getByRole('img', { name: 'Preview of seal-at-receipt.jpg' });
    await preview.waitFor();
    // Previews load lazily, as the reader scrolls to the gallery; the review above it is long.
    await preview.scrollIntoViewIfNeeded();
    await page.waitForFunction((name) => {
      const img = document.querySelector<HTMLImageElement>(`img[alt="Preview of ${name}"]`);
      return !!img && img.complete && img.naturalWidth > 0;
    }, 'seal-at-receipt.jpg');
    expect(await preview.evaluate((img: HTMLImageElement) => [img.naturalWidth, img.naturalHeight])).toEqual([320, 240]);

    for (const [item, original, name] of [
      [sheet, flow.pdf!, 'retest-sheet.pdf'],
      [photo, flow.photo!, 'seal-at-receipt.jpg'],
    ] as const) {
      const shown = (await item.getByTestId('evidence-sha256').innerText()).trim();
      expect(shown).toMatch(/^[0-9a-f]{64}$/);
      const [download] = await Promise.all([page.waitForEvent('download'), item.getByRole('link', { name: `Download ${name}` }).click()]);
      expect(download.suggestedFilename()).toBe(name);
      const saved = await download.path();
      const bytes = fs.readFileSync(saved);
      expect(sha256(bytes)).toBe(shown);
      expect(shown).toBe(sha256(original));
    }
    await page.locator('#evidence').scrollIntoViewIfNeeded();
    await page.locator('#evidence').screenshot({ path: `${fixtures().artifactsDir}/evidence-2-supplier-gallery.png` });
    await screenshot(page, 'evidence-3-supplier-case');
  });
});
