// Getting numbers in fast, in headless Chromium: a pasted printout that becomes a note, a FHIR bundle pasted on
// a phone, and a follow-up gas whose trend shows in the note and on the H+/CO2 chart; once more without JavaScript.
// Every view is checked with axe-core (no serious or critical violation) and photographed into screenshots/;
// no CSP violation and no request leaves the machine. Every patient and printout is invented.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import {
  apiNote,
  browserGate,
  focusedId,
  openSession,
  startHarness,
  waitOpen,
  type Harness,
  type Session,
} from './harness.ts';
import { PRINTOUT } from '../server/fixtures.ts';

const num = (page: Page, label: string) =>
  page.getByRole('textbox', {
    name: new RegExp(`^${label.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}( |$)`),
  });

const run = browserGate('test/e2e/paste.test.ts');

const obs = (code: string, value: number, unit: string, at = '2026-03-02T04:10:00Z') => ({
  resourceType: 'Observation',
  status: 'final',
  code: { coding: [{ system: 'http://loinc.org', code }] },
  effectiveDateTime: at,
  valueQuantity: { value, unit, code: unit, system: 'http://unitsofmeasure.org' },
});
// An invented 38-year-old in the emergency department. LOINC 11558-4 pH of Blood, 11557-6 PCO2 in Blood and
// 1959-6 HCO3 in Blood do not say the sample type, so the page asks; 2524-7 lactate in serum or plasma is read;
// an older PCO2 is set aside for the latest; 33254-4 (pH at the patient's temperature) is not read.
const BUNDLE = JSON.stringify(
  {
    resourceType: 'Bundle',
    type: 'searchset',
    entry: [
      obs('11558-4', 7.29, '[pH]'),
      obs('11557-6', 51, 'mm[Hg]'),
      obs('11557-6', 58, 'mm[Hg]', '2026-03-02T01:00:00Z'),
      obs('1959-6', 24, 'mmol/L'),
      obs('2524-7', 2.6, 'mmol/L'),
      obs('33254-4', 7.27, '[pH]'),
    ].map((resource, i) => ({
      fullUrl: `urn:uuid:00000000-0000-4000-8000-00000000000${i}`,
      resource,
    })),
  },
  null,
  2,
);

describe.skipIf(!run)('pasting results and following up, in Chromium', { timeout: 90_000 }, () => {
  let h: Harness;
  beforeAll(async () => {
    h = await startHarness();
  });
  afterAll(async () => {
    await h?.close();
  });

  const noteText = (s: Session) => s.page.locator('#note-text').inputValue();

  async function finish(s: Session) {
    expect(await s.cspViolations()).toEqual([]);
    expect(s.requests.filter((u) => !u.startsWith(h.origin))).toEqual([]);
    await s.context.close();
  }

  it('a pasted printout becomes a confirmed case in one step and then a note, with the chart beside it', async () => {
    const s = await openSession(h, 'paste-printout');
    const { page } = s;
    await page.goto(`${h.origin}/`);
    await page.getByLabel('Or paste the results').fill(PRINTOUT);
    await s.axe('paste box');
    await s.shot('paste-box');
    await page.getByRole('button', { name: 'Read the pasted text' }).click();

    await waitOpen(page, 'paste');
    expect(await page.title()).toBe('Check what was read · Gasline');
    await expect.poll(() => focusedId(page)).toBe('h-paste');
    const rows = page.locator('.read-table tbody tr');
    expect(await rows.count()).toBe(11);
    expect(await rows.filter({ hasText: 'PaCO2' }).textContent()).toMatch(
      /PaCO2\s+29 mmHg\s+pCO2\s+29\s+mmHg/,
    );
    expect(await page.getByText('standard bicarbonate is not the actual HCO3').isVisible()).toBe(
      true,
    );
    await expect
      .poll(() => page.locator('#announce').textContent())
      .toBe('Read 10 values: check them, then use them.');
    await s.axe('paste confirm');
    await s.shot('confirm');
    await page.getByRole('button', { name: 'Use these values' }).click();

    // sample, gas and chemistry are answered; timing is not asked (Winters' band); the FiO2 read waits to be confirmed
    await waitOpen(page, 'oxygen');
    expect(await page.locator('.entry--said').count()).toBe(3);
    expect(await num(page, 'FiO2').inputValue()).toBe('21');
    expect(await page.locator('#step-oxygen').textContent()).toContain(
      'From the paste: FiO2. Check and go on.',
    );
    await s.axe('oxygen after paste');
    await s.shot('after-confirm');
    await page.getByLabel('No', { exact: true }).check();
    await page.getByRole('button', { name: 'Next' }).click();
    await waitOpen(page, 'patient');
    await num(page, 'Age').fill('52');
    await page.getByLabel('No', { exact: true }).check();
    await page.getByRole('button', { name: 'Finish' }).click();

    await page.locator('#draft').waitFor();
    const expected = await apiNote(h.origin, {
      sample: 'arterial',
      units: { pressure: 'mmHg' },
      gas: { ph: 7.26, pco2: 29, po2: 84, hco3: 13.6, baseExcess: -12.4, lactate: 7.8 },
      chemistry: { na: 141, k: 4.6, cl: 103 },
      oxygen: { fio2: 21 },
      patient: { ageYears: 52, pregnant: false },
    });
    const text = await noteText(s);
    expect(text).toBe(expected.text);
    expect(text).toMatch(/metabolic acidosis/i);
    // anion gap 141 - (103 + 13.6) = 24.4 (Kraut and Madias 2007)
    expect(text).toContain('24.4');
    expect(s.navigations()).toBe(1);

    // the chart in the draft's column on a wide screen, beside the conversation, one gas on it, with the same in words
    const map = page.locator('#chart');
    const [logBox, mapBox] = [await page.locator('.talk').boundingBox(), await map.boundingBox()];
    expect(mapBox!.x).toBeGreaterThan(logBox!.x + logBox!.width - 1);
    expect(await map.locator('.gl-gas-marker').count()).toBe(1);
    await page.getByText('What the chart shows').click();
    // [H+] = 10^(9 - 7.26) = 55 nmol/L (definition of pH)
    expect(await map.locator('.chart-lines').textContent()).toMatch(
      /Today's gas \(1 of 1\): pH 7\.26 \(\[H\+\] 55 nmol\/L\), PaCO2 29 mmHg, HCO3 13\.6 mmol\/L/,
    );
    await s.axe('draft with chart');
    await s.shot('draft');
    await s.shot('draft-in-view', { full: false });

    // print: the note, then the chart, legible on paper
    await page.emulateMedia({ media: 'print' });
    expect(await map.isVisible()).toBe(true);
    expect(await page.locator('.chart-words').isVisible()).toBe(false);
    expect(await page.locator('.followup').isVisible()).toBe(false);
    const printed = await map.locator('svg').boundingBox();
    expect(printed!.width).toBeGreaterThan(400);
    await s.shot('print');
    await page.emulateMedia({ media: 'screen' });
    await finish(s);
  });

  it('a FHIR bundle pasted on a phone: the sample asked, older and unused results listed, then a note', async () => {
    const s = await openSession(h, 'paste-fhir-phone', {
      viewport: { width: 390, height: 844 },
      hasTouch: true,
      isMobile: true,
    });
    const { page } = s;
    await page.goto(`${h.origin}/`);
    await page.getByLabel('Or paste the results').fill(BUNDLE);
    await page.getByRole('button', { name: 'Read the pasted text' }).tap();

    await waitOpen(page, 'paste');
    expect(await page.locator('.step--paste').textContent()).toContain('Read from FHIR JSON.');
    expect(await page.locator('.read-table tbody tr').count()).toBe(4);
    const aside = await page.locator('.aside-list').first().textContent();
    expect(aside).toContain('33254-4');
    expect(aside).toContain(
      'PaCO2 58 mmHg (2026-03-02T01:00:00Z): an older result; the latest one is read',
    );
    expect(await page.getByRole('group', { name: 'Sample type' }).isVisible()).toBe(true);
    await s.axe('fhir confirm');
    await s.shot('confirm');
    await page.getByLabel('Venous').tap();
    await s.shot('confirm-answered', { full: false });
    await page.getByRole('button', { name: 'Use these values' }).tap();

    await waitOpen(page, 'chemistry');
    expect(await page.locator('#step-gas').textContent()).toContain('PvCO2 51 mmHg');
    await page.getByRole('button', { name: 'Skip chemistry' }).tap();
    await page.locator('#step-chemistry.entry--said').waitFor();
    if (await page.locator('#step-timing.entry--open').count())
      await page.getByRole('button', { name: 'Next' }).tap();
    await waitOpen(page, 'oxygen');
    await page.getByLabel('No', { exact: true }).tap();
    await page.getByRole('button', { name: 'Next' }).tap();
    await waitOpen(page, 'patient');
    await num(page, 'Age').fill('38');
    await page.getByRole('button', { name: 'Finish' }).tap();

    await page.locator('#draft').waitFor();
    const text = await noteText(s);
    expect(text).toBe(
      (
        await apiNote(h.origin, {
          sample: 'venous',
          units: { pressure: 'mmHg' },
          gas: { ph: 7.29, pco2: 51, hco3: 24, lactate: 2.6 },
          context: { timing: 'unknown' },
          patient: { ageYears: 38 },
        })
      ).text,
    );
    expect(text).toMatch(/venous/i);
    // on a phone the chart comes below the draft, folded
    const [draftBox, mapBox] = [
      await page.locator('#draft').boundingBox(),
      await page.locator('#chart').boundingBox(),
    ];
    expect(mapBox!.y).toBeGreaterThan(draftBox!.y + draftBox!.height - 1);
    await page.locator('#chart').scrollIntoViewIfNeeded();
    await s.axe('draft on a phone');
    await s.shot('map-below', { full: false });
    await s.shot('draft');
    await finish(s);
  });

  it('a follow-up gas after a ventilator change: the trend in the note and two points on the chart', async () => {
    const s = await openSession(h, 'followup');
    const { page } = s;
    await page.goto(`${h.origin}/`);
    // an invented 66-year-old ventilated for pneumonia; the shorthand read with Ctrl+Enter from the paste box
    await page.getByLabel('Or paste the results').fill('ABG 7.22/61/88/24.3');
    await page.getByLabel('Or paste the results').press('Control+Enter');
    await waitOpen(page, 'paste');
    await page.getByRole('button', { name: 'Use these values' }).click();
    await waitOpen(page, 'chemistry');
    await num(page, 'Na').fill('139');
    await num(page, 'K').fill('4.4');
    await num(page, 'Cl').fill('102');
    await page.getByRole('button', { name: 'Next' }).click();
    await waitOpen(page, 'timing');
    await page.getByLabel('Acute (hours)').check();
    await page.getByRole('button', { name: 'Next' }).click();
    await waitOpen(page, 'oxygen');
    await num(page, 'FiO2').fill('0.5');
    await num(page, 'PEEP or CPAP').fill('8');
    await page.getByLabel('Yes', { exact: true }).check();
    await page.getByRole('button', { name: 'Next' }).click();
    await waitOpen(page, 'ventilator');
    await num(page, 'VT').fill('450');
    await num(page, 'RR').fill('14');
    await num(page, 'Height').fill('170');
    await page.getByLabel('Male', { exact: true }).check();
    await page.getByRole('button', { name: 'Next' }).click();
    await waitOpen(page, 'patient');
    await num(page, 'Age').fill('66');
    await page.getByRole('button', { name: 'Finish' }).click();
    await page.locator('#draft').waitFor();
    const first = await noteText(s);
    expect(first).not.toContain('Since the previous gas');

    // the time typed is the new gas's own; the gas that had none becomes the "first gas"
    await page.getByLabel(/New gas taken at/).fill('after RR change');
    await page.getByRole('button', { name: 'Add the later gas' }).click();
    await waitOpen(page, 'gas');
    await expect.poll(() => focusedId(page)).toBe('f-gas-ph');
    expect(await page.locator('#step-earlier-1').textContent()).toMatch(
      /Earlier gas · first gas[\s\S]*pH 7\.22[\s\S]*RR 14\/min/,
    );
    expect(await page.locator('#draft').count()).toBe(0);
    await s.axe('follow-up gas');
    await s.shot('followup-gas');
    await num(page, 'pH').fill('7.31');
    await num(page, 'PaCO2').fill('49');
    await num(page, 'PaO2').fill('95');
    await num(page, 'HCO3').fill('24.1');
    await page.getByRole('button', { name: 'Next' }).click();
    await waitOpen(page, 'oxygen');
    await page.getByRole('button', { name: 'Next' }).click(); // FiO2 and PEEP unchanged, ventilated as before
    await waitOpen(page, 'ventilator');
    expect(await num(page, 'RR').inputValue()).toBe('14');
    await num(page, 'RR').fill('18');
    await s.shot('followup-ventilator');
    await num(page, 'RR').press('Enter');

    await expect.poll(() => page.locator('li.entry--open').count()).toBe(0);
    expect(await page.locator('.draft-when').textContent()).toContain('after RR change');
    const text = await noteText(s);
    expect(text).toBe(
      (
        await apiNote(h.origin, {
          sample: 'arterial',
          units: { pressure: 'mmHg' },
          gas: { ph: 7.31, pco2: 49, po2: 95, hco3: 24.1 },
          chemistry: { na: 139, k: 4.4, cl: 102 },
          context: { timing: 'acute' },
          oxygen: { fio2: 0.5, peep: 8 },
          ventilator: { vt: 450, rr: 18 },
          patient: { heightCm: 170, sex: 'male', ageYears: 66 },
          previous: [
            {
              label: 'first gas',
              gas: { ph: 7.22, pco2: 61, po2: 88, hco3: 24.3 },
              oxygen: { fio2: 0.5, peep: 8 },
              ventilator: { vt: 450, rr: 14 },
            },
          ],
        })
      ).text,
    );
    expect(text).toContain('Since the previous gas (first gas): pH 7.22 to 7.31');
    // the chart-ready note carries the change made; the prediction (61 x 14 / 18 = 47 mmHg, alveolar ventilation
    // equation, West) is in the full reasoning
    expect(text).toContain('PaCO2 61 to 49 mmHg after RR 14 to 18/min');
    const map = page.locator('#chart');
    expect(await map.locator('.gl-gas-marker').count()).toBe(2);
    expect(await map.locator('.gl-gas-step').count()).toBe(1);
    await page.getByText('What the chart shows').click();
    expect(await map.locator('.chart-lines').textContent()).toContain(
      'Gas 1 of 2, first gas: pH 7.22 ([H+] 60 nmol/L), PaCO2 61 mmHg',
    );
    await s.axe('draft with trend');
    await s.shot('draft-trend');
    await s.shot('draft-trend-in-view', { full: false });
    await finish(s);
  });

  it('without JavaScript a paste is a plain form post too', async () => {
    const s = await openSession(h, 'paste-no-js', { javaScriptEnabled: false });
    const { page } = s;
    await page.goto(`${h.origin}/`);
    await page.getByLabel('Or paste the results').fill('7.31/48/72/23');
    await page.getByRole('button', { name: 'Read the pasted text' }).click();
    await waitOpen(page, 'paste');
    await page.getByLabel('Arterial').check();
    await s.shot('confirm');
    await page.getByRole('button', { name: 'Use these values' }).click();
    await waitOpen(page, 'chemistry');
    expect(s.navigations()).toBe(3);
    expect(await page.locator('#step-gas').textContent()).toContain('PaCO2 48 mmHg');
    await s.context.close();
  });
});
