import { afterAll, describe, expect, it } from 'vitest';
import { openBrowser, screenshot, useSession, waitForHydration, type BrowserSession } from '../support/browser';
import { fixtures } from '../support/fixtures';

// The referee laboratory takes its retest readings from a CSV file: a file with one bad row is
// shown with the row's problem and cannot be used; the corrected file fills the bench form, which
// the laboratory submits as usual. The case is the demo's one already at the referee bench.

// Invented readings: the first two differ by 5.0 m°C, beyond r = 4.0 m°C, so four are needed;
// their mean is −0.5275 °C. Semicolons and decimal commas, as a spreadsheet in many locales saves it.
const measuredAt = new Date(Date.now() - 10 * 60_000).toISOString();
const csv = (fourth: string) =>
  [
    'kind;replicate;freezing_point;unit;measured_at;analyst;note',
    ...['-512,0', '-511,8', '-512,3', '-512,1', '-511,9'].map((v, i) => `calibration;${i + 1};${v};m°C;${measuredAt};Ada Fenwick;`),
    `sample;1;-0,5250;°C;${measuredAt};Ada Fenwick;`,
    `sample;2;-0,5300;°C;${measuredAt};Ada Fenwick;`,
    `sample;3;-0,5270;°C;${measuredAt};Ada Fenwick;`,
    `sample;4;${fourth};°C;${measuredAt};Ada Fenwick;retyped from the bench sheet`,
  ].join('\r\n');
// Line 10 is the fourth reading of the sample: a letter O where a zero belongs.
const BAD_LINE = 10;

let browser: BrowserSession | null = null;

afterAll(async () => {
  await browser?.close().catch(() => undefined);
});

async function caseAtTheBench(): Promise<string> {
  const response = await fetch(`${fixtures().baseUrl}/api/v1/cases?pageSize=100`, { headers: { cookie: fixtures().cookies.lab } });
  expect(response.status).toBe(200);
  const list = (await response.json()) as { items: { id: string; status: string }[] };
  const atBench = list.items.find((c) => c.status === 'retest');
  if (!atBench) throw new Error(`No case at the referee bench among ${list.items.map((c) => c.status).join(', ')}`);
  return atBench.id;
}

describe('readings imported from a CSV file at the referee bench', () => {
  it('lab@ sees the bad row, imports the corrected file and submits the retest', { timeout: 150_000 }, async () => {
    const caseId = await caseAtTheBench();
    browser = await openBrowser();
    await useSession(browser.context, fixtures().cookies.lab);
    const page = await browser.context.newPage();
    await page.goto(`/cases/${caseId}`);
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toContain('At the referee bench');
    await page.getByRole('heading', { name: 'Bench: submit retest' }).waitFor();
    await waitForHydration(page, '#reading-0');

    await page.getByText('Import readings from a CSV file').click();
    const fileInput = page.getByLabel('CSV file of readings');
    await fileInput.setInputFiles({ name: 'retest-readings.csv', mimeType: 'text/csv', buffer: Buffer.from(csv('-O,5280'), 'utf8') });

    const preview = page.getByTestId('csv-preview');
    await preview.waitFor();
    const badRow = preview.locator(`tr[data-line="${BAD_LINE}"]`);
    expect(await badRow.innerText()).toContain(`✕ Line ${BAD_LINE}, freezing point: “-O,5280” is not a number.`);
    expect(await badRow.getAttribute('aria-invalid')).toBe('true');
    expect(await preview.locator('tr[aria-invalid]').count()).toBe(1);
    await page.getByRole('alert').filter({ hasText: 'The file cannot be used as it is: 1 row has a problem, shown beside it.' }).waitFor();
    const use = page.getByRole('button', { name: 'Use these readings' });
    expect(await use.isDisabled()).toBe(true);
    // Nothing reached the form.
    expect(await page.locator('#reading-0').inputValue()).toBe('');
    await screenshot(page, 'readings-import-1-row-error');

    await fileInput.setInputFiles({ name: 'retest-readings-corrected.csv', mimeType: 'text/csv', buffer: Buffer.from(csv('-0,5280'), 'utf8') });
    await page.getByText('✓ Every row can be used.').waitFor();
    expect(await preview.locator('tr[aria-invalid]').count()).toBe(0);
    expect(await preview.locator(`tr[data-line="${BAD_LINE}"]`).innerText()).toContain('−0.5280 °C');
    await screenshot(page, 'readings-import-2-clean-preview');
    await use.click();
    await page.getByText('4 readings of the sample and 5 calibration readings from retest-readings-corrected.csv are in the form.').waitFor();

    // The form holds the file's readings, in replicate order, and its own live checks judge them.
    expect(await Promise.all([0, 1, 2, 3].map((i) => page.locator(`#reading-${i}`).inputValue()))).toEqual(['-0.5250', '-0.5300', '-0.5270', '-0.5280']);
    expect(await Promise.all([0, 1, 2, 3, 4].map((i) => page.locator(`#cal-${i}`).inputValue()))).toEqual(['-0.5120', '-0.5118', '-0.5123', '-0.5121', '-0.5119']);
    expect(await page.locator('#analystName').inputValue()).toBe('Ada Fenwick');
    await page.getByText('Fit for work: 5 of 5 within ±4.0 m°C.').waitFor();
    await page.getByText('Accepted: mean of 4 = −0.5275 °C.').waitFor();

    // The rest is the laboratory's to complete and submit, as without a file.
    const instrument = page.locator('#instrumentId');
    if ((await instrument.inputValue()) === '') await instrument.selectOption({ index: 1 });
    await page.locator('#sampleTemperature').fill('20.1');
    await page.getByRole('button', { name: 'Submit retest' }).click();
    await page.waitForURL((url) => url.pathname === `/cases/${caseId}` && url.searchParams.get('done') === 'submit_retest');
    await page.getByRole('status').filter({ hasText: 'Retest submitted' }).waitFor();
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toContain('Before the board');
    const readings = await page.locator('#readings').innerText();
    expect(readings).toContain('Retest (referee laboratory)');
    expect(readings).toContain('−0.5275 °C');
    await screenshot(page, 'readings-import-3-submitted');
  });

  it('plant@ maps another layout on the intake form, after an empty file is refused', async () => {
    browser ??= await openBrowser();
    await useSession(browser.context, fixtures().cookies.plant);
    const page = await browser.context.newPage();
    await page.goto('/intake');
    await waitForHydration(page, '#reading-0');
    await page.getByText('Import readings from a CSV file').click();
    const fileInput = page.getByLabel('CSV file of readings');

    await fileInput.setInputFiles({ name: 'empty.csv', mimeType: 'text/csv', buffer: Buffer.alloc(0) });
    await page.getByRole('alert').filter({ hasText: 'empty.csv: The file is empty.' }).waitFor();

    // An invented export with its own column names, m°C in the header, semicolons and decimal commas.
    const foreign = ['Run No;Sample ID;FP [mC];Operator', '1;R-LW-104;-512,4;B. Hollis', '2;R-LW-104;-513,0;B. Hollis'].join('\n');
    await fileInput.setInputFiles({ name: 'bench-export.csv', mimeType: 'text/csv', buffer: Buffer.from(foreign, 'utf8') });
    await page.getByRole('group', { name: 'Column mapping' }).waitFor();
    await page.getByText('✓ Every row can be used.').waitFor();
    const preview = page.getByTestId('csv-preview');
    expect(await preview.locator('tr[data-line="2"]').innerText()).toContain('−0.5124 °C');

    // The preview follows the mapping: read as °C, the same numbers are no freezing points of milk.
    const unit = page.locator('select:has(option[value="mC"])');
    expect(await unit.locator('option').allTextContents()).toEqual(['m°C', '°C', '°H']);
    await unit.selectOption('C');
    await page.getByText('If the file is in m°C, choose m°C as the unit.').first().waitFor();
    expect(await preview.locator('tr[aria-invalid]').count()).toBe(2);
    await screenshot(page, 'readings-import-4-mapping-wrong-unit');
    await unit.selectOption('mC');
    await page.getByText('✓ Every row can be used.').waitFor();

    await page.getByRole('button', { name: 'Use these readings' }).click();
    await page.getByText('2 readings of the sample from bench-export.csv are in the form.').waitFor();
    expect([await page.locator('#reading-0').inputValue(), await page.locator('#reading-1').inputValue()]).toEqual(['-0.5124', '-0.5130']);
    expect(await page.locator('#analystName').inputValue()).toBe('B. Hollis');
    expect(await page.locator('#routineCode').inputValue()).toBe('R-LW-104');
    await page.getByTestId('readings-live').getByText('Final result −0.5127 °C').waitFor();
  });
});
