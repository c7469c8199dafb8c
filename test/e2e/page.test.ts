// The page end to end in headless Chromium, from the empty page to a copied note, for three invented
// scenarios, and once more with JavaScript off. Every step is checked with axe-core (no serious or
// critical violation) and photographed into screenshots/ (regenerate: npx vitest run test/e2e).
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

/** A number field by its label; the label also carries the unit ("HCO3 mmol/L"). */
const num = (page: Page, label: string) =>
  page.getByRole('textbox', {
    name: new RegExp(`^${label.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}( |$)`),
  });

const run = browserGate('test/e2e/page.test.ts');

// each step now redraws the draft and its map beside the question: the walks take longer on a busy machine
describe.skipIf(!run)('the step-by-step page in Chromium', { timeout: 90_000 }, () => {
  let h: Harness;
  beforeAll(async () => {
    h = await startHarness();
  });
  afterAll(async () => {
    await h?.close();
  });

  const noteText = (s: Session) => s.page.locator('#note-text').inputValue();

  async function copyNote(s: Session): Promise<string> {
    await s.page.getByRole('button', { name: 'Copy note' }).click();
    await expect
      .poll(() => s.page.locator('#announce').textContent())
      .toBe('Note copied to the clipboard.');
    return s.page.evaluate(() => navigator.clipboard.readText());
  }

  async function finish(s: Session) {
    expect(await s.cspViolations()).toEqual([]);
    // nothing left the machine: every request went to this server
    expect(s.requests.filter((u) => !u.startsWith(h.origin))).toEqual([]);
    await s.context.close();
  }

  it('a ventilated patient entered in kPa, by keyboard alone', async () => {
    const s = await openSession(h, 'ventilated-kpa');
    const { page } = s;
    await page.goto(`${h.origin}/`);
    expect(await page.title()).toBe('Sample · Gasline');
    await s.axe('sample');
    await s.shot('sample');

    // the first choice has the focus: Enter answers it
    expect(await page.evaluate(() => document.activeElement?.textContent)).toBe('Arterial');
    await page.keyboard.press('Enter');
    await waitOpen(page, 'gas');
    await expect.poll(() => focusedId(page)).toBe('f-gas-ph');
    await page.keyboard.type('7.28');
    // the pressure unit sits just before pH: back one stop, arrow to kPa, on again
    await page.keyboard.press('Shift+Tab');
    await page.keyboard.press('ArrowRight');
    expect(await page.locator('[data-unit-for="units.pressure"]').first().textContent()).toBe(
      'kPa',
    );
    await page.keyboard.press('Tab');
    await page.keyboard.press('Tab');
    await page.keyboard.type('7.6');
    await page.keyboard.press('Tab');
    await page.keyboard.type('8.9');
    await page.keyboard.press('Tab');
    await page.keyboard.type('26');
    await s.axe('gas');
    await s.shot('gas');
    await page.keyboard.press('Enter');

    await waitOpen(page, 'chemistry');
    await expect.poll(() => focusedId(page)).toBe('f-chemistry-na');
    await expect
      .poll(() => page.locator('#announce').textContent())
      .toMatch(
        /^Reads now: ABG pH 7\.28, PaCO2 7\.6 kPa, HCO3 26\.0 mmol\/L: acute respiratory acidosis.* Next, chemistry: /,
      );
    await s.axe('chemistry');
    await s.shot('chemistry');
    await page.getByRole('button', { name: 'Skip chemistry' }).focus();
    await page.keyboard.press('Enter');

    await waitOpen(page, 'timing');
    // "Not sure" is checked and focused; two steps up is "Acute"
    await expect.poll(() => focusedId(page)).toBe('f-context-timing-2');
    await page.keyboard.press('ArrowUp');
    await page.keyboard.press('ArrowUp');
    expect(await page.getByLabel('Acute (hours)').isChecked()).toBe(true);
    await s.axe('timing');
    await s.shot('timing');
    await page.keyboard.press('Enter');

    await waitOpen(page, 'oxygen');
    await expect.poll(() => focusedId(page)).toBe('f-oxygen-fio2');
    await page.keyboard.type('0.5');
    await page.keyboard.press('Tab');
    await page.keyboard.type('10');
    await page.keyboard.press('Tab');
    await page.keyboard.press('Space'); // "Yes"
    await s.axe('oxygen');
    await s.shot('oxygen');
    await page.keyboard.press('Enter');

    await waitOpen(page, 'ventilator');
    await expect.poll(() => focusedId(page)).toBe('f-ventilator-vt');
    // VT, RR, plateau, end-tidal CO2 and inspiratory time (left empty), height
    for (const value of ['520', '14', '27', '', '', '175']) {
      await page.keyboard.type(value);
      await page.keyboard.press('Tab');
    }
    await page.keyboard.press('ArrowRight'); // from Female to Male
    expect(await page.getByLabel('Male', { exact: true }).isChecked()).toBe(true);
    await page.keyboard.press('Tab');
    await page.keyboard.type('7.35');
    await s.axe('ventilator');
    await s.shot('ventilator');
    await page.keyboard.press('Enter');

    await waitOpen(page, 'patient');
    await expect.poll(() => focusedId(page)).toBe('f-patient-ageYears');
    expect(await page.locator('#step-patient').textContent()).toContain(
      'Pregnancy not asked: male patient.',
    );
    await page.keyboard.type('58');
    await s.axe('patient');
    await s.shot('patient');
    await page.keyboard.press('Enter');

    await page.locator('#draft').waitFor();
    await expect.poll(() => focusedId(page)).toBe('draft-title');
    const text = await noteText(s);
    const expected = await apiNote(h.origin, {
      sample: 'arterial',
      units: { pressure: 'kPa' },
      gas: { ph: 7.28, pco2: 7.6, po2: 8.9, hco3: 26 },
      context: { timing: 'acute' },
      oxygen: { fio2: 0.5, peep: 10 },
      ventilator: { vt: 520, rr: 14, pplat: 27, targetPh: 7.35 },
      patient: { heightCm: 175, sex: 'male', ageYears: 58 },
    });
    expect(text).toBe(expected.text);
    expect(await page.locator('#handover-text').inputValue()).toBe(expected.handover);
    expect(text).toMatch(/acute respiratory acidosis/i);
    expect(text).toContain('PaCO2 7.6 kPa');
    expect(text).toContain('RR 17/min');
    expect(s.navigations()).toBe(1); // every step was an htmx swap, not a page load
    await s.axe('draft');
    await s.shot('draft');
    await s.shot('draft-in-view', { full: false });
    expect(await copyNote(s)).toBe(text);

    // change an earlier answer: the ventilator rate; the draft follows
    await page.getByRole('button', { name: /^Edit ventilator/i }).click();
    await waitOpen(page, 'ventilator');
    // the draft stays beside the question while an answer is changed
    expect(await page.locator('#draft').count()).toBe(1);
    await num(page, 'RR').fill('20');
    await s.shot('ventilator-changed');
    await num(page, 'RR').press('Enter');
    await page.locator('#draft').waitFor();
    const changed = await noteText(s);
    expect(changed).not.toBe(text);
    // the handover's background carries the settings the gas was taken on
    expect(await page.locator('#handover-text').inputValue()).toContain('RR 20/min');
    expect(changed).not.toContain('RR 17/min');
    expect(await copyNote(s)).toBe(changed);

    // print in plain text: the draft only, with the clinician's own edits
    await page.locator('#note-text').press('Control+End');
    await page.locator('#note-text').pressSequentially('\nDiscussed with the ICU consultant.');
    await page.emulateMedia({ media: 'print' });
    await page.evaluate(() => window.dispatchEvent(new Event('beforeprint')));
    expect(await page.locator('.log').isVisible()).toBe(false);
    expect(await page.locator('.checks').isVisible()).toBe(false);
    expect(await page.locator('.print-text[data-print-of="note-text"]').textContent()).toContain(
      'Discussed with the ICU consultant.',
    );
    await s.shot('print');
    await page.emulateMedia({ media: 'screen' });
    await finish(s);
  });

  it('a venous sample in an emergency department, on a phone, by touch', async () => {
    const s = await openSession(h, 'venous-ed-phone', {
      viewport: { width: 390, height: 844 },
      hasTouch: true,
      isMobile: true,
    });
    const { page } = s;
    await page.goto(`${h.origin}/`);
    await s.axe('sample');
    await s.shot('sample');
    await page.getByRole('button', { name: 'Venous' }).tap();

    await waitOpen(page, 'gas');
    expect(await page.locator('#step-gas').textContent()).toContain(
      'the PO2 of a venous sample does not show arterial oxygenation',
    );
    expect(await page.locator('[name="gas.po2"]').count()).toBe(0);
    await num(page, 'pH').fill('7.31');
    await num(page, 'PvCO2').fill('53');
    await num(page, 'HCO3').fill('26');
    await num(page, 'Lactate').fill('3.1');
    await s.axe('gas');
    await s.shot('gas');
    await page.getByRole('button', { name: 'Next' }).tap();

    await waitOpen(page, 'chemistry');
    await num(page, 'Na').fill('134');
    await num(page, 'K').fill('5.2');
    await num(page, 'Cl').fill('97');
    await num(page, 'Glucose').fill('8.4');
    await page.getByLabel('Glucose unit').selectOption('mmol/L');
    await num(page, 'Urea or BUN').fill('11');
    await page.getByLabel('Urea unit').selectOption('urea-mmol/L');
    await s.axe('chemistry');
    await s.shot('chemistry');
    await page.getByRole('button', { name: 'Next' }).tap();

    await waitOpen(page, 'timing');
    await s.axe('timing');
    await s.shot('timing');
    await page.getByRole('button', { name: 'Next' }).tap(); // "Not sure"

    await waitOpen(page, 'oxygen');
    expect(await page.locator('[name="oxygen.fio2"]').count()).toBe(0);
    expect(await page.locator('#step-oxygen').textContent()).toContain(
      'No FiO2 asked: oxygenation (A-a gradient, P/F ratio) is not assessed from a venous sample.',
    );
    await page.getByLabel('No', { exact: true }).tap();
    await s.axe('oxygen');
    await s.shot('oxygen');
    await page.getByRole('button', { name: 'Next' }).tap();

    await waitOpen(page, 'patient');
    expect(await page.locator('#step-ventilator').textContent()).toContain(
      'No ventilator questions: not on a ventilator.',
    );
    await num(page, 'Age').fill('71');
    await s.axe('patient');
    await s.shot('patient');
    await page.getByRole('button', { name: 'Finish' }).tap();

    await page.locator('#draft').waitFor();
    const text = await noteText(s);
    const body = {
      sample: 'venous',
      units: { pressure: 'mmHg', glucose: 'mmol/L', urea: 'urea-mmol/L' },
      gas: { ph: 7.31, pco2: 53, hco3: 26, lactate: 3.1 },
      chemistry: { na: 134, k: 5.2, cl: 97, glucose: 8.4, urea: 11 },
      context: { timing: 'unknown' },
      patient: { ageYears: 71 },
    };
    expect(text).toBe((await apiNote(h.origin, body)).text);
    expect(text).toMatch(/venous/i);
    expect(text).not.toMatch(/A-a gradient \d|P\/F ratio \d/);
    await s.axe('draft');
    await s.shot('draft');
    await s.shot('draft-in-view', { full: false });
    expect(await copyNote(s)).toBe(text);

    // the patient turns out to be chronic: the draft follows the new timing
    await page.getByRole('button', { name: /^Edit timing/i }).tap();
    await waitOpen(page, 'timing');
    await page.getByLabel('Chronic (days or longer)').tap();
    await page.getByRole('button', { name: 'Finish' }).tap();
    await page.locator('#draft').waitFor();
    const changed = await noteText(s);
    expect(changed).not.toBe(text);
    expect(changed).toBe(
      (await apiNote(h.origin, { ...body, context: { timing: 'chronic' } })).text,
    );
    await s.shot('draft-chronic');
    await finish(s);
  });

  it('a metabolic acidosis with full chemistry: a refused value, the explain view, Markdown and print', async () => {
    const s = await openSession(h, 'metabolic-full');
    const { page } = s;
    await page.goto(`${h.origin}/`);
    await s.shot('sample');
    await page.getByRole('button', { name: 'Arterial' }).click();

    await waitOpen(page, 'gas');
    await num(page, 'pH').fill('9.1');
    await num(page, 'PaCO2').fill('22');
    await num(page, 'PaO2').fill('101');
    await num(page, 'HCO3').fill('8.7');
    await num(page, 'Base excess').fill('-18');
    await num(page, 'Lactate').fill('2.4');
    await page.getByRole('button', { name: 'Next' }).click();
    // refused at the field with the schema's message; the value never reaches a draft
    await expect
      .poll(() => page.locator('#f-gas-ph-error').textContent())
      .toBe('Error: pH 9.1 is outside 6.50-8.00: check the value');
    await expect.poll(() => focusedId(page)).toBe('f-gas-ph');
    expect(await page.locator('#f-gas-ph').getAttribute('aria-invalid')).toBe('true');
    expect(await page.locator('#draft').count()).toBe(0);
    await s.axe('gas-error');
    await s.shot('gas-error');
    await num(page, 'pH').fill('7.21');
    await num(page, 'pH').press('Enter');

    await waitOpen(page, 'chemistry');
    await num(page, 'Na').fill('131');
    await num(page, 'K').fill('5.6');
    await num(page, 'Cl').fill('96');
    await num(page, 'Albumin').fill('3.9');
    await num(page, 'Glucose').fill('412');
    await num(page, 'Urea or BUN').fill('34');
    await num(page, 'Measured osmolality').fill('302');
    await s.axe('chemistry');
    await s.shot('chemistry');
    await page.getByRole('button', { name: 'Next' }).click();

    // Winters: 1.5 x 8.7 + 8 = 21 (+/- 2); PaCO2 22 fits, so there is no respiratory process to time
    await waitOpen(page, 'oxygen');
    expect(await page.locator('#step-timing').textContent()).toContain(
      'Timing not asked: these numbers show no respiratory process',
    );
    await num(page, 'FiO2').fill('0.21');
    await page.getByLabel('No', { exact: true }).check();
    await s.axe('oxygen');
    await s.shot('oxygen');
    await page.getByRole('button', { name: 'Next' }).click();

    await waitOpen(page, 'patient');
    await num(page, 'Age').fill('29');
    await page.getByLabel('No', { exact: true }).check();
    await s.axe('patient');
    await s.shot('patient');
    await page.getByRole('button', { name: 'Finish' }).click();

    await page.locator('#draft').waitFor();
    const body = {
      sample: 'arterial',
      units: { pressure: 'mmHg' },
      gas: { ph: 7.21, pco2: 22, po2: 101, hco3: 8.7, baseExcess: -18, lactate: 2.4 },
      chemistry: { na: 131, k: 5.6, cl: 96, albumin: 3.9, glucose: 412, urea: 34, osmolality: 302 },
      oxygen: { fio2: 0.21 },
      patient: { ageYears: 29, pregnant: false },
    };
    const text = await noteText(s);
    expect(text).toBe((await apiNote(h.origin, body)).text);
    expect(text).toMatch(/metabolic acidosis/i);
    // anion gap 131 - (96 + 8.7) = 26.3 (Kraut and Madias 2007), albumin-corrected 26.3 + 2.5 x (4.0 - 3.9) = 26.55,
    // printed 26.6 (Figge 1998)
    expect(text).toContain('AG 26.6 mmol/L (albumin-corrected)');

    // the explain view: formula, inputs and source of each number
    await page.getByText(/How each number was worked out/).click();
    const gap = page.locator('.explain-item', { hasText: 'Anion gap 26.3 mmol/L' });
    await expect.poll(() => gap.textContent()).toContain('AG = Na - (Cl + HCO3)');
    expect(await gap.textContent()).toContain('Na 131 mmol/L; Cl 96 mmol/L; HCO3 8.7 mmol/L');
    expect(await gap.textContent()).toMatch(/Source\s+Kraut/);
    await s.axe('draft');
    await s.shot('draft');
    expect(await copyNote(s)).toBe(text);

    // change the albumin: the corrected gap and the draft follow
    await page.getByRole('button', { name: /^Edit chemistry/i }).click();
    await waitOpen(page, 'chemistry');
    expect(await num(page, 'Albumin').inputValue()).toBe('3.9');
    await num(page, 'Albumin').fill('2.1');
    await num(page, 'Albumin').press('Enter');
    await page.locator('#draft').waitFor();
    const changed = await noteText(s);
    expect(changed).not.toBe(text);
    expect(changed).toBe(
      (await apiNote(h.origin, { ...body, chemistry: { ...body.chemistry, albumin: 2.1 } })).text,
    );

    // Markdown: the note in Markdown, and a preview that follows the clinician's typing
    await page.getByLabel('Markdown').check();
    await page.locator('#preview').waitFor();
    expect(await noteText(s)).toBe(
      (
        await apiNote(
          h.origin,
          { ...body, chemistry: { ...body.chemistry, albumin: 2.1 } },
          'markdown',
        )
      ).text,
    );
    await page
      .locator('#note-text')
      .fill('**Seen with the registrar.**\n\n- <b onclick="x()">fluids</b> as per local protocol');
    await expect
      .poll(() => page.locator('#preview').innerHTML())
      .toContain('<strong>Seen with the registrar.</strong>');
    expect(await page.locator('#preview').innerHTML()).not.toContain('onclick');
    await s.axe('markdown');
    await s.shot('markdown');

    // print in Markdown: the rendered preview of the clinician's text, then the handover
    await page.emulateMedia({ media: 'print' });
    await page.evaluate(() => window.dispatchEvent(new Event('beforeprint')));
    expect(await page.locator('.log').isVisible()).toBe(false);
    expect(await page.locator('#note-text').isVisible()).toBe(false);
    expect(await page.locator('#preview').isVisible()).toBe(true);
    expect(await page.locator('#preview').textContent()).toContain('Seen with the registrar.');
    expect(await page.locator('.print-text[data-print-of="handover-text"]').isVisible()).toBe(true);
    await s.shot('print');
    await page.emulateMedia({ media: 'screen' });

    await page.getByRole('link', { name: 'New case' }).click();
    await waitOpen(page, 'sample');
    expect(await page.locator('.entry--answer').count()).toBe(0);
    await finish(s);
  });

  it('without JavaScript every step is a plain form post that returns the whole page', async () => {
    const s = await openSession(h, 'no-js', { javaScriptEnabled: false });
    const { page } = s;
    await page.goto(`${h.origin}/`);
    await page.getByRole('button', { name: 'Capillary' }).click();
    await waitOpen(page, 'gas');
    await num(page, 'pH').fill('7.36');
    await num(page, 'PcCO2').fill('47');
    await num(page, 'HCO3').fill('abc');
    await page.getByRole('button', { name: 'Next' }).click();
    expect(await page.locator('#f-gas-hco3-error').textContent()).toBe(
      'Error: HCO3 must be a number',
    );
    await s.shot('gas-error');
    await num(page, 'HCO3').fill('26');
    await page.getByRole('button', { name: 'Next' }).click();
    await waitOpen(page, 'chemistry');
    await page.getByRole('button', { name: 'Skip chemistry' }).click();
    await page.locator('li.entry--open').waitFor();
    if (await page.locator('#step-timing.entry--open').count())
      await page.getByRole('button', { name: 'Next' }).click();
    await waitOpen(page, 'oxygen');
    await page.getByLabel('No', { exact: true }).check();
    await page.getByRole('button', { name: 'Next' }).click();
    await waitOpen(page, 'patient');
    await page.getByRole('button', { name: 'Finish' }).click();
    await page.locator('#draft').waitFor();
    expect(s.navigations()).toBeGreaterThanOrEqual(7); // each answer was a page load
    expect(await page.locator('#note-text').inputValue()).toMatch(/capillary/i);
    // no copy button without a script: the page says how to copy instead
    expect(await page.getByRole('button', { name: 'Copy note' }).isVisible()).toBe(false);
    expect(await page.getByText('Select the text and copy it').isVisible()).toBe(true);
    // (axe needs script in the page, so the accessibility checks run in the scenarios above)
    await s.shot('draft');
    await page.getByRole('button', { name: /^Edit gas/i }).click();
    await waitOpen(page, 'gas');
    expect(await page.locator('#f-gas-hco3').inputValue()).toBe('26');
    await s.context.close();
  });
});
