import { afterAll, describe, expect, it } from 'vitest';
import type { Locator, Page } from 'playwright-core';
import { openBrowser, screenshot, useSession, waitForHydration, type BrowserSession } from '../support/browser';
import { fixtures } from '../support/fixtures';

// One dispute walked from the supplier's desk to the board, each party in a browser of its own.
// The steps build on each other: the case the supplier opens is the one the plant dispatches,
// the laboratory retests and the arbiter reviews.

// The demo's contestable rejection of supplier@'s group, rejected today with no case yet.
const HERD = 'UL-112';
const INTAKE_READINGS = ['−0.5040 °C', '−0.5031 °C'];
// The same readings as the server stores them (tenths of m°C), should they leak into the page data.
const INTAKE_RAW = /[:[,]-50(40|31)[,\]}]/;
const EXPLANATION = 'The tank at Stonecroft End was agitated for ten minutes before sampling and our own check read well below the limit.';
const REMEDY = 'Pay the load in full.';
const COURIER = 'Cool box 7 with data logger, by the valley courier';
const PLANT_ANSWER = 'Bay 1 cryoscope passed its morning check; we stand by the intake result.';
const CALIBRATION = ['-0.5120', '-0.5118', '-0.5123', '-0.5121', '-0.5119'];
// The first two differ by 5.0 m°C, beyond r = 4.0 m°C; the four together give a mean of −0.5275 °C.
const FIRST_TWO = ['-0.5250', '-0.5300'];
const NEXT_TWO = ['-0.5270', '-0.5280'];

const browsers: BrowserSession[] = [];
const flow: { caseId?: string; caseNumber?: string; sealNumber?: string; intakeValue?: string } = {};

afterAll(async () => {
  for (const b of browsers) await b.close().catch(() => undefined);
});

/** A fresh browser signed in as one demo account, with a page open at the given address. */
async function asParty(key: string, path: string): Promise<{ page: Page; status: number | undefined; posts: () => number }> {
  const browser = await openBrowser();
  browsers.push(browser);
  await useSession(browser.context, fixtures().cookies[key]);
  const page = await browser.context.newPage();
  let posts = 0;
  page.on('request', (request) => {
    if (request.method() === 'POST') posts++;
  });
  const response = await page.goto(path);
  return { page, status: response?.status(), posts: () => posts };
}

function caseIdOrFail(): string {
  if (!flow.caseId) throw new Error('No case: the supplier step did not open one.');
  return flow.caseId;
}

const heading = (page: Page) => page.getByRole('heading', { level: 1 });
const flash = (page: Page, text: string) => page.getByRole('status').filter({ hasText: text });

/** Waits for a lifecycle form's redirect back to the case file with its outcome. */
async function waitForDone(page: Page, transition: string): Promise<void> {
  await page.waitForURL((url) => url.pathname === `/cases/${flow.caseId}` && url.searchParams.get('done') === transition);
}

async function fillAll(page: Page, values: Record<string, string>): Promise<void> {
  for (const [selector, value] of Object.entries(values)) await page.locator(selector).fill(value);
}

async function visibleText(page: Page): Promise<string> {
  return page.locator('main').innerText();
}

/** Nothing of the intake result on the page: neither as text nor in the data the page carries. */
async function expectBlind(page: Page): Promise<void> {
  const text = await visibleText(page);
  const html = await page.content();
  for (const value of INTAKE_READINGS) {
    expect(text).not.toContain(value);
    expect(html).not.toContain(value);
  }
  expect(flow.intakeValue).toBeTruthy();
  expect(text).not.toContain(flow.intakeValue!);
  // The only freezing points of −0.50x °C in this case are the intake's.
  expect(text).not.toMatch(/[−-]0\.50\d/);
  expect(html).not.toMatch(INTAKE_RAW);
  expect(html).not.toContain(EXPLANATION);
  expect(html).not.toContain(PLANT_ANSWER);
  await page.getByText('Withheld from the referee laboratory until its retest is submitted').waitFor();
  expect(await page.locator('#review').count()).toBe(0);
}

async function expectFieldError(page: Page, id: string, text: string): Promise<Locator> {
  const error = page.locator(`#${id}-error`);
  await error.waitFor();
  expect(await error.textContent()).toContain(text);
  return error;
}

describe('a dispute from the supplier’s desk to the board', () => {
  it('supplier@ opens a dispute on the contestable rejection from the desk', async () => {
    const { page, posts } = await asParty('supplier', '/desk');
    await heading(page).waitFor();
    await screenshot(page, 'dispute-flow-0-supplier-desk');
    const row = page.locator('#rejections tbody tr').filter({ hasText: HERD }).filter({ has: page.getByRole('link', { name: 'Open a dispute' }) });
    expect(await row.count(), await page.locator('main').innerText()).toBe(1);
    expect(await row.textContent()).toContain('Rejected');
    await row.getByRole('link', { name: 'Open a dispute' }).click();
    await page.waitForURL(/\/deliveries\/[0-9a-f-]{36}\/dispute$/);
    const disputeUrl = page.url();
    await heading(page).filter({ hasText: 'Open a dispute' }).waitFor();
    await waitForHydration(page, '#explanation');

    // The empty form: an error beside each field, and nothing sent to the server.
    const before = posts();
    await page.getByRole('button', { name: 'Open a dispute' }).click();
    await expectFieldError(page, 'grounds', 'Choose at least one ground.');
    await expectFieldError(page, 'explanation', 'at least 20 characters');
    await expectFieldError(page, 'remedy', 'at least 3 characters');
    expect(await page.locator('#explanation').getAttribute('aria-invalid')).toBe('true');
    expect(await page.locator('#remedy').getAttribute('aria-invalid')).toBe('true');
    expect(posts()).toBe(before);
    expect(page.url()).toBe(disputeUrl);
    await screenshot(page, 'dispute-flow-1a-supplier-empty-form');

    // Still no case on this delivery: the form is offered again after a reload.
    await page.reload();
    expect(await page.getByText('This result is already disputed in').count()).toBe(0);
    await waitForHydration(page, '#explanation');

    await page.locator('input[name="grounds"][value="instrument"]').check();
    await page.locator('input[name="grounds"][value="sampling"]').check();
    await page.locator('#explanation').fill(EXPLANATION);
    await page.locator('#remedy').fill(REMEDY);
    await page.getByRole('button', { name: 'Open a dispute' }).click();
    await page.waitForURL((url) => /^\/cases\/[0-9a-f-]{36}$/.test(url.pathname) && url.searchParams.get('opened') === '1');

    flow.caseId = new URL(page.url()).pathname.split('/')[2];
    const title = (await heading(page).textContent()) ?? '';
    expect(title).toContain('Opened');
    // The heading is the case number followed by the status badge.
    flow.caseNumber = title.trim().split(/\s+/)[0];
    expect(flow.caseNumber).toMatch(/\d/);
    await flash(page, `Your dispute ${flow.caseNumber} is open.`).waitFor();
    const contested = await page.locator('#contested').innerText();
    expect(contested).toContain(HERD);
    expect(contested).toContain(EXPLANATION);
    expect(contested).toContain(REMEDY);
    expect(contested).toContain('Instrument');
    expect(contested).toContain('Sampling');
    await screenshot(page, 'dispute-flow-1b-supplier-case-opened');
  });

  it('plant@ dispatches the sample, after a wrong seal number is refused', async () => {
    const caseId = caseIdOrFail();
    const { page, posts } = await asParty('plant', `/cases/${caseId}`);
    expect(await heading(page).textContent()).toContain('Opened');

    // The intake result as the parties see it, for the blind check at the laboratory.
    flow.intakeValue = (await page.locator('#contested dt', { hasText: 'Freezing point' }).locator('xpath=following-sibling::dd[1]').textContent())?.trim();
    expect(flow.intakeValue).toMatch(/^−0\.50\d °C$/);
    const intakeReadings = await page.locator('#readings').innerText();
    for (const value of INTAKE_READINGS) expect(intakeReadings).toContain(value);

    const panel = page.locator('section').filter({ has: page.getByRole('heading', { name: 'Dispatch sample' }) });
    const intro = (await panel.locator('p').first().textContent()) ?? '';
    const seal = intro.match(/against the record \(([^)]+)\)/)?.[1];
    expect(seal, `seal number in "${intro}"`).toMatch(/^LVS-\d{6}$/);
    flow.sealNumber = seal!;

    const fillDispatch = async (sealNumber: string) => {
      await waitForHydration(page, '#sealNumber');
      const lab = page.locator('#labOrganisationId');
      if ((await lab.inputValue()) === '') await lab.selectOption({ index: 1 });
      await fillAll(page, { '#sealNumber': sealNumber, '#courier': COURIER, '#temperature': '4.2', '#answer': PLANT_ANSWER });
      await page.getByLabel('The seal is intact and matches the record').check();
      await page.getByRole('button', { name: 'Dispatch sample' }).click();
    };

    const before = posts();
    await fillDispatch('LVS-000000');
    await expectFieldError(page, 'sealNumber', `The retained sample was sealed as ${flow.sealNumber}.`);
    await page.getByRole('alert').filter({ hasText: 'The seal number differs from the one recorded' }).waitFor();
    expect(await page.locator('#sealNumber').getAttribute('aria-invalid')).toBe('true');
    // It went to the server, which refused it.
    expect(posts()).toBeGreaterThan(before);
    expect(new URL(page.url()).searchParams.get('done')).toBeNull();
    await screenshot(page, 'dispute-flow-2a-plant-wrong-seal');

    await page.reload();
    expect(await heading(page).textContent()).toContain('Opened');
    expect(await page.locator('#custody').innerText()).not.toContain('Dispatched');
    await page.getByRole('heading', { name: 'Dispatch sample' }).waitFor();

    await fillDispatch(flow.sealNumber);
    await waitForDone(page, 'dispatch');
    await flash(page, 'recorded as dispatched').waitFor();
    expect(await heading(page).textContent()).toContain('Sample in transit');
    expect(await page.getByRole('heading', { name: 'Dispatch sample' }).count()).toBe(0);
    const custody = await page.locator('#custody').innerText();
    expect(custody).toContain('Dispatched');
    expect(custody).toContain(COURIER);
    expect(custody).toContain('4.2 °C');
    await screenshot(page, 'dispute-flow-2b-plant-dispatched');
  });

  it('lab@ retests blind, and sees the intake result only after submitting', { timeout: 150_000 }, async () => {
    const caseId = caseIdOrFail();
    const { page } = await asParty('lab', `/cases/${caseId}`);
    expect(await heading(page).textContent()).toContain('Sample in transit');
    await page.getByRole('heading', { name: 'Record receipt' }).waitFor();
    await expectBlind(page);
    await screenshot(page, 'dispute-flow-3a-lab-blind-before-receipt');

    await waitForHydration(page, '#sealNumber');
    await fillAll(page, { '#sealNumber': flow.sealNumber!, '#temperature': '4.6' });
    await page.getByLabel('Seal intact', { exact: true }).check();
    await page.getByRole('button', { name: 'Record receipt' }).click();
    await waitForDone(page, 'receive');
    await flash(page, 'Receipt recorded.').waitFor();
    expect(await heading(page).textContent()).toContain('At the referee bench');
    expect(await page.locator('#custody').innerText()).toContain(`Seal ${flow.sealNumber} matches the record.`);
    await page.getByRole('heading', { name: 'Bench: submit retest' }).waitFor();
    await expectBlind(page);
    await screenshot(page, 'dispute-flow-3b-lab-received');

    await waitForHydration(page, '#reading-0');
    const instrument = page.locator('#instrumentId');
    if ((await instrument.inputValue()) === '') await instrument.selectOption({ index: 1 });
    await fillAll(page, Object.fromEntries(CALIBRATION.map((v, i) => [`#cal-${i}`, v])));
    await page.getByText('Fit for work: 5 of 5 within ±4.0 m°C.').waitFor();
    await page.locator('#sampleTemperature').fill('20.1');
    await fillAll(page, { '#reading-0': FIRST_TWO[0], '#reading-1': FIRST_TWO[1] });

    const submit = page.getByRole('button', { name: 'Submit retest' });
    await page.getByText('2 more readings needed: the first two differ by 5.0 m°C, more than r = 4.0 m°C.').waitFor();
    expect(await submit.isDisabled()).toBe(true);
    await screenshot(page, 'dispute-flow-3c-lab-two-more-needed');

    await page.getByRole('button', { name: 'Add reading (2 more needed)' }).click();
    await page.locator('#reading-2').fill(NEXT_TWO[0]);
    await page.getByText('1 more reading needed').waitFor();
    expect(await submit.isDisabled()).toBe(true);
    await page.getByRole('button', { name: 'Add reading (1 more needed)' }).click();
    await page.locator('#reading-3').fill(NEXT_TWO[1]);
    await page.getByText('Accepted: mean of 4 = −0.5275 °C.').waitFor();
    expect(await submit.isEnabled()).toBe(true);
    // Still blind while the readings are being entered.
    await expectBlind(page);
    await screenshot(page, 'dispute-flow-3d-lab-accepted');

    await submit.click();
    await waitForDone(page, 'submit_retest');
    await flash(page, 'Retest submitted').waitFor();
    expect(await heading(page).textContent()).toContain('Before the board');
    expect(await page.getByRole('heading', { name: 'Bench: submit retest' }).count()).toBe(0);
    expect(await page.getByText('Withheld from the referee laboratory until its retest is submitted').count()).toBe(0);

    // Unblinded: the intake result, its readings and the parties' words beside the laboratory's own.
    const contested = page.locator('#contested');
    expect(await contested.locator('dt', { hasText: 'Freezing point' }).locator('xpath=following-sibling::dd[1]').textContent()).toBe(flow.intakeValue);
    expect(await contested.innerText()).toContain(EXPLANATION);
    const readings = await page.locator('#readings').innerText();
    for (const value of INTAKE_READINGS) expect(readings).toContain(value);
    expect(readings).toContain('Retest (referee laboratory)');
    expect(readings).toContain('−0.5275 °C');
    expect(await page.locator('#custody').innerText()).toContain(PLANT_ANSWER);
    // The chart now plots the intake's two readings beside the laboratory's four, one titled mark each.
    expect(await page.locator('#review figure svg[role="img"]').locator('circle > title, path > title').count()).toBe(6);
    await screenshot(page, 'dispute-flow-3e-lab-submitted');
  });

  it('arbiter@ reviews both laboratories, the chart and the proposal', async () => {
    const caseId = caseIdOrFail();
    const { page } = await asParty('arbiter', `/cases/${caseId}`);
    expect(await heading(page).textContent()).toContain('Before the board');

    const review = page.locator('#review');
    await review.waitFor();
    await review.getByText('Plant laboratory (intake)', { exact: true }).waitFor();
    await review.getByText('Referee laboratory (retest)', { exact: true }).waitFor();
    const side = await review.innerText();
    expect(side).toMatch(/−0\.50\d{2} °C \(mean of 2\)/);
    expect(side).toContain('−0.5275 °C (mean of 4)');
    // 24 m°C apart, far beyond the critical difference.
    expect(side).toContain('they disagree');

    // The chart comes drawn with the page's HTML: one mark per reading of both laboratories, each
    // titled with its value, and the same figures in the image's accessible name.
    const chart = review.locator('figure svg[role="img"]');
    const titles = await chart.locator('circle > title, path > title').allTextContents();
    expect(titles).toHaveLength(6);
    // Values as the chart writes them: three decimals, a fourth only when it is not zero.
    expect(titles.filter((t) => t.startsWith('Plant laboratory, reading ')).map((t) => t.split(': ')[1]).sort()).toEqual(['−0.5031 °C', '−0.504 °C']);
    expect(titles.filter((t) => t.startsWith('Referee laboratory, reading '))).toEqual([
      'Referee laboratory, reading 1: −0.525 °C',
      'Referee laboratory, reading 2: −0.530 °C',
      'Referee laboratory, reading 3: −0.527 °C',
      'Referee laboratory, reading 4: −0.528 °C',
    ]);
    const name = (await chart.getAttribute('aria-label')) ?? '';
    expect(name).toContain('result −0.5275 °C ± r/2');
    expect(name).toMatch(/Limit −0\.\d{3,4} °C\./);
    expect(await review.locator('figure').innerText()).toContain('Referee laboratory');
    expect(await review.locator('figure figcaption').innerText()).toContain('critical difference');

    await review.getByRole('heading', { name: 'Proposal' }).waitFor();
    expect(side).toContain('Order a further test');
    const checks = review.locator('table tbody tr');
    expect(await checks.count()).toBeGreaterThan(2);
    for (const row of await checks.all()) {
      const cells = row.locator('td');
      expect(await cells.nth(0).textContent()).toMatch(/(Pass|Fail|Not applicable|Missing)$/);
      expect((await cells.nth(1).innerText()).trim()).not.toBe('');
      expect((await cells.nth(2).innerText()).trim()).not.toBe('');
    }
    expect(side).toContain('The proposal supports the arbiter, who decides. Local regulations and the supply contract prevail.');
    await screenshot(page, 'dispute-flow-4-arbiter-review');
  });

  it('supplier2@ of another group gets the not-found page for that case', async () => {
    const caseId = caseIdOrFail();
    const { page, status } = await asParty('supplier2', `/cases/${caseId}`);
    expect(status).toBe(404);
    await page.getByRole('heading', { name: 'There is nothing here you can open' }).waitFor();
    const html = await page.content();
    expect(html).not.toContain(flow.caseNumber!);
    expect(html).not.toContain(EXPLANATION);
    await screenshot(page, 'dispute-flow-5-supplier2-not-found');
  });
});
