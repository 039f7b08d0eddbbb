import { afterAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openBrowser, screenshot, useSession, waitForHydration, type BrowserSession } from '../support/browser';
import { fixtures } from '../support/fixtures';

// The plant's intake desk: a calibration check, then a watered load recorded on the checked
// instrument and rejected, then the supplier seeing the rejection with its contest deadline.
// A second plant instrument is made unfit by a failed check to show that the scheme refuses an
// intake test on it; it is checked again afterwards so later specs find the demo as seeded.

const GOOD_INSTRUMENT = 'LW-CRY-01';
const OTHER_INSTRUMENT = 'LW-CRY-02';
const SUPPLIER_GROUP = 'Upper Larch Producers’ Group';
// All five within ±4.0 m°C of the −0.512 °C standard.
const CALIBRATION = ['-0.5120', '-0.5141', '-0.5098', '-0.5125', '-0.5116'];
// All five 8 m°C or more off the standard: the check fails.
const FAILING_CALIBRATION = ['-0.5200', '-0.5210', '-0.5205', '-0.5215', '-0.5220'];
// The first two differ by 5.0 m°C, beyond r = 4.0 m°C. The four give −0.5005 °C either way
// (mean or median), about 3.8 % added water against −0.520 °C: beyond the 3 % that rejects a load.
const FIRST_TWO = ['-0.4980', '-0.5030'];
const NEXT_TWO = ['-0.5000', '-0.5010'];

const stamp = Date.now().toString().slice(-6);
const REFERENCE = `LW-E2E-${stamp}-W`;
const REFUSED_REFERENCE = `LW-E2E-${stamp}-U`;

const browsers: BrowserSession[] = [];
const flow: { deliveryId?: string; rulesVersion?: string; checkedAt?: string } = {};

afterAll(async () => {
  for (const b of browsers) await b.close().catch(() => undefined);
});

async function asParty(key: string, path: string): Promise<{ page: Page; posts: () => number }> {
  const browser = await openBrowser();
  browsers.push(browser);
  await useSession(browser.context, fixtures().cookies[key]);
  const page = await browser.context.newPage();
  let posts = 0;
  page.on('request', (request) => {
    if (request.method() === 'POST') posts++;
  });
  await page.goto(path);
  return { page, posts: () => posts };
}

const heading = (page: Page) => page.getByRole('heading', { level: 1 });

/** The browser's local time, shifted, as a datetime-local input takes it. */
async function localTime(page: Page, offsetMinutes: number): Promise<string> {
  return page.evaluate((offset) => {
    const d = new Date(Date.now() + offset * 60_000);
    return new Date(d.getTime() - d.getTimezoneOffset() * 60_000).toISOString().slice(0, 16);
  }, offsetMinutes);
}

/** Opens an instrument's page from the plant's instrument list. */
async function openInstrument(page: Page, serial: string): Promise<void> {
  await page.goto('/instruments');
  await page.getByRole('link', { name: serial, exact: true }).click();
  await page.waitForURL(/\/instruments\/[0-9a-f-]{36}$/);
  await heading(page).filter({ hasText: `Instrument ${serial}` }).waitFor();
  await waitForHydration(page, '#cal-0');
}

async function fillCalibration(page: Page, readings: string[]): Promise<void> {
  for (const [i, value] of readings.entries()) await page.locator(`#cal-${i}`).fill(value);
}

/** Everything of the intake form but the instrument and the readings. */
async function fillLoad(page: Page, reference: string): Promise<void> {
  await waitForHydration(page, '#reference');
  const farm = page.locator(`#farmId optgroup[label="${SUPPLIER_GROUP}"] option`).first();
  const farmId = await farm.getAttribute('value');
  expect(farmId).toBeTruthy();
  await page.locator('#farmId').selectOption(farmId!);
  await page.locator('#reference').fill(reference);
  await page.locator('#volumeLitres').fill('8400');
  await page.locator('#collectedAt').fill(await localTime(page, -120));
  await page.locator('#receivedAt').fill(await localTime(page, -30));
  await page.locator('#receiptTemperature').fill('4.1');
  await page.locator('#tanker').fill('Tanker 3');
  await page.locator('#compartment').fill('2');
  await page.locator('#sealNumber').fill(`LVS-E2E-${reference.slice(-8)}`);
  await page.locator('#retainedTemperature').fill('3.8');
  await page.locator('#sampleTemperature').fill('20.2');
}

async function addReading(page: Page, index: number, value: string): Promise<void> {
  await page.getByRole('button', { name: /^Add reading/ }).click();
  await page.locator(`#reading-${index}`).fill(value);
}

describe('the intake desk from calibration to the supplier’s rejection notice', () => {
  it('plant@ checks LW-CRY-01 on the sodium chloride standard and sees it fit', async () => {
    const { page } = await asParty('plant', '/instruments');
    await heading(page).filter({ hasText: 'Instruments' }).waitFor();
    await openInstrument(page, GOOD_INSTRUMENT);
    expect(await page.locator('#nominal').inputValue()).toBe('-0.512');
    await fillCalibration(page, CALIBRATION);
    await page.getByText('Fit for work: 5 of 5 within ±4.0 m°C of the standard; valid 24 h.').waitFor();
    await screenshot(page, 'intake-1a-plant-calibration-live');

    await page.getByRole('button', { name: 'Record check' }).click();
    await page.waitForURL((url) => url.searchParams.get('done') === 'passed');
    await page.getByRole('status').filter({ hasText: 'Check recorded: 5 of 5 readings within tolerance. The instrument is fit for work until' }).waitFor();
    const latest = page.locator('table tbody tr').first();
    const row = await latest.innerText();
    expect(row).toContain('Passed');
    expect(row).toContain('5 of 5 within ±4.0 m°C, 3 needed');
    expect(row).toContain('−0.5141');
    flow.checkedAt = (await latest.locator('td').first().innerText()).trim();
    expect(flow.checkedAt).not.toBe('');
    expect(await page.locator('main header').first().innerText()).toContain('Fit for work until');
    await screenshot(page, 'intake-1b-plant-calibration-recorded');
  });

  it('plant@ is refused an intake on an instrument whose check failed, and nothing is recorded', async () => {
    const { page, posts } = await asParty('plant', '/instruments');
    await openInstrument(page, OTHER_INSTRUMENT);
    // Dated a few minutes back, so the check that restores the instrument below is the later one.
    await page.locator('#checkedAt').fill(await localTime(page, -20));
    await fillCalibration(page, FAILING_CALIBRATION);
    await page.getByText('Not fit: 0 of 5 within ±4.0 m°C; 3 needed.').waitFor();
    await page.getByRole('button', { name: 'Record check' }).click();
    await page.waitForURL((url) => url.searchParams.get('done') === 'failed');
    await page.getByRole('alert').filter({ hasText: 'Check recorded as failed: 0 of 5 within tolerance, 3 needed.' }).waitFor();
    const instrumentUrl = page.url();

    await page.goto('/intake');
    await heading(page).filter({ hasText: 'Record an intake' }).waitFor();
    await fillLoad(page, REFUSED_REFERENCE);
    const option = page.locator('#instrumentId option', { hasText: OTHER_INSTRUMENT });
    expect(await option.innerText()).toContain('UNFIT');
    await page.locator('#instrumentId').selectOption((await option.getAttribute('value'))!);
    await page.getByRole('alert').filter({ hasText: 'The scheme refuses intake tests on an instrument without a passing check in force.' }).waitFor();
    await page.locator('#reading-0').fill('-0.5250');
    await addReading(page, 1, '-0.5260');
    await page.getByText('Final result −0.5255 °C').waitFor();
    const submit = page.getByRole('button', { name: 'Record intake' });
    expect(await submit.isEnabled()).toBe(true);

    const before = posts();
    await submit.click();
    const refusal = page.getByRole('alert').filter({ hasText: `Refused: instrument ${OTHER_INSTRUMENT} had no passing calibration check in force when the sample was tested.` });
    await refusal.waitFor();
    expect(posts()).toBeGreaterThan(before);
    const fieldError = page.locator('#instrumentId-error');
    await fieldError.waitFor();
    expect(await fieldError.innerText()).toContain('The scheme does not allow intake tests on such an instrument.');
    expect(new URL(page.url()).pathname).toBe('/intake');
    await screenshot(page, 'intake-2a-plant-refused-unfit');

    // Nothing recorded: the plant's newest deliveries hold no load with that reference.
    await page.goto('/deliveries');
    await page.locator('#deliveries table tbody tr').first().waitFor();
    expect(await page.locator('#deliveries').innerText()).not.toContain(REFUSED_REFERENCE);

    // Checked again and passing, the instrument is fit once more.
    await page.goto(instrumentUrl.split('?')[0]);
    await waitForHydration(page, '#cal-0');
    await fillCalibration(page, CALIBRATION);
    await page.getByRole('button', { name: 'Record check' }).click();
    await page.waitForURL((url) => url.searchParams.get('done') === 'passed');
    expect(await page.locator('main header').first().innerText()).toContain('Fit for work until');
  });

  it('plant@ records a watered load: two more readings are asked for, and the load is rejected', async () => {
    const { page } = await asParty('plant', '/intake');
    await heading(page).filter({ hasText: 'Record an intake' }).waitFor();
    const intro = await page.locator('main').innerText();
    flow.rulesVersion = intro.match(/Judged under .+?, version (\d+)/)?.[1];
    expect(flow.rulesVersion, intro.slice(0, 400)).toMatch(/^\d+$/);

    await fillLoad(page, REFERENCE);
    const option = page.locator('#instrumentId option', { hasText: GOOD_INSTRUMENT });
    expect(await option.innerText()).toMatch(/— fit$/);
    await page.locator('#instrumentId').selectOption((await option.getAttribute('value'))!);

    const submit = page.getByRole('button', { name: 'Record intake' });
    await page.locator('#reading-0').fill(FIRST_TWO[0]);
    await page.getByText('1 more reading needed').waitFor();
    expect(await submit.isDisabled()).toBe(true);
    await addReading(page, 1, FIRST_TWO[1]);
    await page.getByText('2 more readings needed: the first two differ by 5.0 m°C, more than r = 4.0 m°C.').waitFor();
    expect(await submit.isDisabled()).toBe(true);
    await page.getByRole('button', { name: 'Add reading (2 more needed)' }).waitFor();
    await screenshot(page, 'intake-3a-plant-two-more-needed');

    await addReading(page, 2, NEXT_TWO[0]);
    await page.getByText('1 more reading needed').waitFor();
    expect(await submit.isDisabled()).toBe(true);
    await addReading(page, 3, NEXT_TWO[1]);
    await page.getByText(/^Final result −0\.5005 °C: (mean|median) of four readings/).waitFor();
    expect(await submit.isEnabled()).toBe(true);
    const preview = page.getByTestId('verdict-preview');
    await preview.waitFor();
    const previewText = await preview.innerText();
    expect(previewText).toContain('Rejected');
    expect(previewText).toContain(`rules v${flow.rulesVersion}`);
    await screenshot(page, 'intake-3b-plant-rejection-preview');

    await submit.click();
    await page.waitForURL((url) => /^\/deliveries\/[0-9a-f-]{36}$/.test(url.pathname) && url.searchParams.get('done') === 'recorded');
    flow.deliveryId = new URL(page.url()).pathname.split('/')[2];
    expect(await heading(page).innerText()).toContain(`Delivery ${REFERENCE}`);
    await page.getByRole('status').filter({ hasText: 'Intake recorded as rejected.' }).waitFor();
    const result = await page.locator('#result').innerText();
    expect(result).toContain('Rejected');
    expect(result).toContain(`rules v${flow.rulesVersion}`);
    expect(result).toContain(`version ${flow.rulesVersion}, in force from`);
    expect(result).toMatch(/−0\.50[01] °C/);
    for (const value of [...FIRST_TWO, ...NEXT_TWO]) expect(result).toContain(`${value.replace('-', '−')} °C`);
    // The result rests on the check recorded above.
    expect(result).toContain(GOOD_INSTRUMENT);
    expect(result).toContain(`Passed ${flow.checkedAt}`);
    expect(result).toContain('5 of 5 within tolerance');
    expect(result).toContain('Contest by');
    await screenshot(page, 'intake-3c-plant-delivery-rejected');
  });

  it('supplier@ sees the rejected load on the desk and in its deliveries with a contest deadline', async () => {
    expect(flow.deliveryId, 'the plant step recorded no delivery').toBeTruthy();
    const { page } = await asParty('supplier', '/desk');
    await heading(page).waitFor();
    const deskRow = page.locator('#rejections tbody tr').filter({ hasText: REFERENCE });
    expect(await deskRow.count(), await page.locator('main').innerText()).toBe(1);
    const deskText = await deskRow.innerText();
    expect(deskText).toContain('Rejected');
    expect(deskText).toContain(`rules v${flow.rulesVersion}`);
    expect(deskText).toContain('Contest by');
    expect(await deskRow.getByRole('link', { name: 'Open a dispute' }).getAttribute('href')).toBe(`/deliveries/${flow.deliveryId}/dispute`);
    await screenshot(page, 'intake-4a-supplier-desk');

    await page.goto('/deliveries');
    const row = page.locator('#deliveries tbody tr').filter({ hasText: REFERENCE });
    await row.waitFor();
    const rowText = await row.innerText();
    expect(rowText).toContain('Rejected');
    expect(rowText).toContain('Contest by');
    const due = await row.locator('time').getAttribute('datetime');
    // The scheme's 24 h contest window runs from the moment the supplier was told, just now.
    const hoursLeft = (new Date(due!).getTime() - Date.now()) / 3_600_000;
    expect(hoursLeft).toBeGreaterThan(23);
    expect(hoursLeft).toBeLessThanOrEqual(24);
    await screenshot(page, 'intake-4b-supplier-deliveries');
  });
});
