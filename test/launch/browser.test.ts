// Both launch kinds in headless Chromium, as a clinician meets them: from the record's chart (EHR launch) and from
// Gasline's own first step (standalone launch), through the record's consent page (on another site: localhost
// against 127.0.0.1), the confirm view with the earlier gases, the steps, a copied note, and a filed draft that
// passes both validators. The launch's cookies stay out of reach of scripts and no token reaches a file.
import { tmpdir } from 'node:os';
import type { Page } from 'playwright-core';
import { chromium } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ARGS, CHROMIUM, browserGate, openSession, type Harness } from '../e2e/harness.ts';
import { changedSince, filesHolding, startLaunch, type Running } from './harness.ts';
import { fhirErrors, schemaErrors } from './validators.ts';

const run = browserGate('test/launch/browser.test.ts');

/** Answer the steps left after the confirm (acute, not ventilated, the rest as read) until the draft shows. */
async function toDraft(page: Page) {
  for (let i = 0; i < 8 && !(await page.locator('#draft').count()); i++) {
    const open = await page.locator('li.entry--open').getAttribute('id');
    if (open === 'step-timing') await page.getByLabel('Acute (hours)').check();
    if (open === 'step-oxygen') await page.getByLabel('No', { exact: true }).check();
    await page.locator('li.entry--open .step-form button.button--primary').click();
    await page.waitForFunction(
      (was) =>
        document.querySelector('li.entry--open')?.id !== was || !!document.querySelector('#draft'),
      open,
    );
  }
  await page.locator('#draft').waitFor();
}

// a shared two-core machine runs these beside other suites: a browser flow is given a minute and a half
describe.skipIf(!run)('launching from the record in Chromium', { timeout: 90_000 }, () => {
  let record: Running;
  let h: Harness;
  const started = Date.now();
  beforeAll(async () => {
    record = await startLaunch({
      host: 'localhost',
      env: (r) => ({ SMART_ISSUERS: r.fhirBase }),
    });
    const browser = await chromium.launch({ executablePath: CHROMIUM, args: ARGS });
    h = { browser, origin: record.origin, server: null as never, close: () => browser.close() };
  });
  afterAll(async () => {
    await h?.close();
    await record?.close();
  });

  it('EHR launch: chart, consent, confirm with earlier gases, steps, copy, file as a draft', async () => {
    const s = await openSession(h, 'launch-ehr');
    const { page } = s;
    await page.goto(`${record.record.origin}/ehr/launch?patient=pt-1&encounter=enc-1`);
    await page.getByRole('button', { name: 'Allow' }).click();

    await page.locator('#step-paste').waitFor();
    expect(await page.title()).toBe('Check what the record gave · Gasline');
    const rows = page.locator('.read-table tbody tr');
    expect(await rows.filter({ hasText: 'PaCO2' }).textContent()).toMatch(/62\s*mmHg/);
    const also = await page.locator('.step--paste').textContent();
    expect(also).toContain('Earlier gases of the last 48 hours (2)');
    expect(also).toMatch(/64 years .*female, height 162 cm/);
    expect(await page.evaluate(() => document.cookie)).toBe(''); // HttpOnly: no script reads them
    await s.axe('record confirm');
    await s.shot('confirm');
    await page.getByRole('button', { name: 'Use these values' }).click();

    await toDraft(page);
    expect(await page.locator('.entry--earlier').count()).toBe(2);
    const note = await page.locator('#note-text').inputValue();
    expect(note).toMatch(/7\.29/);
    await page.getByRole('button', { name: 'Copy note' }).click();
    await expect.poll(() => page.evaluate(() => navigator.clipboard.readText())).toBe(note);
    // no axe or screenshot before the filing: they leave empty style attributes that an htmx swap carries over

    await page.getByRole('button', { name: 'File as a draft note in the record' }).click();
    await page
      .locator('#fileback')
      .getByText('Filed in the record as a draft note (DocumentReference/doc-1)')
      .waitFor();
    await s.axe('draft filed');
    await s.shot('filed');
    const [doc] = record.record.documents as Record<string, any>[];
    const { id: _id, meta: _meta, ...sent } = doc!;
    expect(schemaErrors(sent)).toEqual([]);
    expect(fhirErrors(sent)).toEqual([]);
    expect(Buffer.from(sent.content[0].attachment.data, 'base64').toString('utf8')).toBe(
      note.trim(),
    );
    expect(sent.context.encounter).toEqual([{ reference: 'Encounter/enc-1' }]);
    expect(await s.cspViolations()).toEqual([]);
    await s.context.close();
  });

  it('standalone launch: from the first step, pick the patient, confirm, copy', async () => {
    const s = await openSession(h, 'launch-standalone', { viewport: { width: 390, height: 844 } });
    const { page } = s;
    await page.goto(`${record.origin}/`);
    await s.axe('first step with the record button');
    await page.getByRole('link', { name: 'Read the gases from the record' }).click();
    await page.getByLabel('Patient').selectOption('pt-2');
    await page.getByRole('button', { name: 'Allow' }).click();

    await page.locator('#step-paste').waitFor();
    expect(await page.locator('.step--paste').textContent()).toContain(
      'No earlier gas in the last 48 hours.',
    );
    await s.axe('standalone confirm');
    await s.shot('confirm');
    await page.getByRole('button', { name: 'Use these values' }).click();
    await toDraft(page);
    const note = await page.locator('#note-text').inputValue();
    expect(note).toMatch(/metabolic acidosis/i);
    await page.getByRole('button', { name: 'Copy note' }).click();
    await expect.poll(() => page.evaluate(() => navigator.clipboard.readText())).toBe(note);
    await s.shot('draft');
    expect(await s.cspViolations()).toEqual([]);
    await s.context.close();
  });

  it('a refused consent lands on a clear page with the manual path open', async () => {
    const s = await openSession(h, 'launch-refused');
    const { page } = s;
    await page.goto(`${record.record.origin}/ehr/launch?patient=pt-1`);
    await page.getByRole('button', { name: 'Deny' }).click();
    await page.locator('#notice').waitFor();
    expect(await page.locator('#notice').textContent()).toContain(
      'Access was not granted in the record',
    );
    expect(await page.getByLabel('Or paste the results').isVisible()).toBe(true);
    await s.axe('refused');
    await s.shot('refused');
    await s.context.close();
  });

  it('no token issued in these launches is in any file written meanwhile (the browser profile included)', () => {
    expect(record.record.issued.length).toBeGreaterThanOrEqual(2);
    expect(filesHolding(changedSince(tmpdir(), started - 1000, 6), record.record.issued)).toEqual(
      [],
    );
    for (const line of record.logs)
      for (const token of record.record.issued) expect(line).not.toContain(token);
  });
});
