import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openBrowser, screenshot, useSession, waitForHydration, type BrowserSession } from '../support/browser';
import { account, fixtures } from '../support/fixtures';

// The end of a dispute in the browser: the arbiter signs the seeded case that is before the board,
// the supplier downloads the decision letter, and anyone can check it on the public verification page.
// The steps build on each other.

const REASONS = 'Both laboratories agree within the critical difference, and the accepted value lies beyond the upper limit even with the guard band.';
const browsers: BrowserSession[] = [];
const downloads = fs.mkdtempSync(path.join(os.tmpdir(), 'countersample-letters-'));
const flow: { recordSha256?: string; letter?: string } = {};

afterAll(async () => {
  for (const b of browsers) await b.close().catch(() => undefined);
  fs.rmSync(downloads, { recursive: true, force: true });
});

async function asParty(key: string | null, address: string): Promise<Page> {
  const browser = await openBrowser();
  browsers.push(browser);
  if (key) await useSession(browser.context, fixtures().cookies[key]);
  const page = await browser.context.newPage();
  await page.goto(address);
  return page;
}

describe('the binding decision, end to end', () => {
  const { caseOfSupplier } = fixtures();

  it('arbiter@ sees the form with the proposal’s outcome and the settlement, and a wrong password signs nothing', async () => {
    const page = await asParty('arbiter', `/cases/${caseOfSupplier.id}`);
    const form = page.getByTestId('decision-form');
    await waitForHydration(page, '[data-testid="decision-form"]');
    expect(await page.getByLabel('Outcome').inputValue()).toBe('uphold');
    const settlement = await page.getByTestId('settlement-lines').innerText();
    expect(settlement).toMatch(/Withheld at intake: .* l × 0\.46 EUR\/l = €/);
    expect(settlement).toContain('borne by the supplier');
    expect(await form.innerText()).toContain(account('arbiter').name);

    await page.getByTestId('decision-form').getByLabel('Reasons').fill(REASONS);
    await page.getByLabel('I sign this as the board’s binding decision on this case.').check();
    await page.getByLabel('Your password').fill('not-my-password-at-all');
    await page.getByRole('button', { name: 'Sign decision' }).click();
    await page.getByText('The password is not correct.').waitFor();
    expect(await page.getByLabel('Your password').inputValue()).toBe('');
    await screenshot(page, 'decision-1-wrong-password');
    await page.reload();
    await page.getByTestId('decision-form').waitFor();
    expect(await page.getByRole('heading', { level: 1 }).innerText()).toContain('Before the board');
  });

  it('arbiter@ signs with the password; the case is sealed, decided and offers no form any more', async () => {
    const page = await asParty('arbiter', `/cases/${caseOfSupplier.id}`);
    await waitForHydration(page, '[data-testid="decision-form"]');
    await page.getByTestId('decision-form').getByLabel('Reasons').fill(REASONS);
    await page.getByLabel('I sign this as the board’s binding decision on this case.').check();
    await page.getByLabel('Your password').fill(fixtures().password);
    await page.getByRole('button', { name: 'Sign decision' }).click();
    await page.waitForURL((url) => url.pathname === `/cases/${caseOfSupplier.id}` && url.searchParams.get('signed') === '1', { timeout: 60_000 });
    await page.getByRole('status').filter({ hasText: 'The decision is signed and the case sealed.' }).waitFor();
    expect(await page.getByRole('heading', { level: 1 }).innerText()).toContain('Decided');
    const decision = await page.locator('#decision').innerText();
    expect(decision).toContain('Binding decision');
    expect(decision).toContain('Intake result upheld');
    expect(decision).toContain(`${account('arbiter').name}`);
    expect(decision).toContain('meaning: binding decision');
    flow.recordSha256 = (await page.getByTestId('record-sha256').innerText()).trim();
    expect(flow.recordSha256).toMatch(/^[0-9a-f]{64}$/);
    expect(await page.getByTestId('decision-form').count()).toBe(0);
    expect(await page.getByRole('button', { name: 'Order a further test' }).count()).toBe(0);
    await screenshot(page, 'decision-2-signed');
  });

  it('supplier@ downloads the decision letter', async () => {
    const page = await asParty('supplier', `/cases/${caseOfSupplier.id}`);
    expect(await page.getByRole('button', { name: /Withdraw/ }).count()).toBe(0);
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download the decision letter (PDF)' }).first().click()]);
    expect(download.suggestedFilename()).toMatch(new RegExp(`^${caseOfSupplier.number}-decision-[0-9a-f]{8}\\.pdf$`));
    flow.letter = path.join(downloads, download.suggestedFilename());
    await download.saveAs(flow.letter);
    expect(fs.readFileSync(flow.letter).subarray(0, 5).toString()).toBe('%PDF-');
    await screenshot(page, 'decision-3-supplier-case');
  });

  it('anyone checks the letter file and its record hash on the public verification page', async () => {
    expect(flow.letter && flow.recordSha256).toBeTruthy();
    const page = await asParty(null, '/verify');
    await waitForHydration(page, '[data-testid="letter-check-form"]');
    await page.getByLabel('The letter (PDF)').setInputFiles(flow.letter!);
    await page.getByRole('button', { name: 'Check the letter' }).click();
    const result = page.getByTestId('verification-result');
    await result.waitFor();
    const text = await result.innerText();
    expect(text).toContain('This file is a decision letter exactly as it was issued.');
    expect(text).toContain(caseOfSupplier.number);
    expect(text).toContain('nothing was changed after sealing');
    expect(text).toContain('The signature is valid');
    // Nothing of the record itself is shown to a stranger.
    expect(await page.locator('main').innerText()).not.toContain(REASONS);
    await screenshot(page, 'decision-4-verify-file');

    await page.goto(`/verify?hash=${flow.recordSha256}`);
    await page.getByText('This hash belongs to a sealed decision.').waitFor();
    await screenshot(page, 'decision-5-verify-hash');
  });

  it('arbiter@ corrects the sealed decision: a new decision supersedes it and both stay listed', async () => {
    const page = await asParty('arbiter', `/cases/${caseOfSupplier.id}`);
    const details = page.getByTestId('correct-decision');
    await details.locator('summary').click();
    await waitForHydration(page, '[data-testid="correction-form"]');
    const form = page.getByTestId('correction-form');
    await form.getByRole('button', { name: 'Sign correction' }).click();
    expect(await form.getByText('Say in at least 20 characters what is corrected and why.').count()).toBe(1);
    await form.getByLabel('What is corrected, and why').fill('The reasons named the wrong laboratory; the outcome itself is unchanged.');
    await form.getByLabel('Reasons').fill(REASONS);
    await form.getByLabel('I sign this as the board’s binding decision on this case, superseding the decision in force.').check();
    await form.getByLabel('Your password').fill(fixtures().password);
    await form.getByRole('button', { name: 'Sign correction' }).click();
    await page.waitForURL((url) => url.searchParams.get('corrected') === '1', { timeout: 60_000 });
    await page.getByRole('status').filter({ hasText: 'The correction is signed and sealed' }).waitFor();
    const decision = await page.locator('#decision').innerText();
    expect(decision).toContain('Superseded');
    expect(decision).toContain('corrects an earlier decision');
    expect(await page.getByTestId('record-sha256').count()).toBe(2);
    await screenshot(page, 'decision-6-corrected');
  });
});
