// The page as a conversation, in headless Chromium on a desktop (1280x900) and a phone (390x844): the draft from
// the first gas, the actions a clinician needs for each path counted against issue 13 (typed arterial gas to a
// copied line <= 6, pasted printout <= 4, follow-up gas <= 5), the copy buttons in view whenever the draft
// updates, the unit switch, kept edits, the trend, axe (WCAG 2.2 AA tags) at every step, and print to PDF.
// An action is one click or tap, one key press, or one value typed into a field (moving to it included).
// Patients are invented.
import { execFileSync } from 'node:child_process';
import { existsSync, writeFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  SCREENSHOTS,
  browserGate,
  openSession,
  startHarness,
  waitOpen,
  type Harness,
  type Session,
} from './harness.ts';

const run = browserGate('test/e2e/conversation.test.ts');

const SIZES = {
  desktop: { viewport: { width: 1280, height: 900 } },
  phone: { viewport: { width: 390, height: 844 }, hasTouch: true, isMobile: true },
} as const;
type Size = keyof typeof SIZES;

const num = (page: Page, label: string) =>
  page.getByRole('textbox', {
    name: new RegExp(`^${label.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}( |$)`),
  });

/** The actions of one path, counted as they are done. */
function counter(page: Page, size: Size) {
  let n = 0;
  const press = async (loc: ReturnType<Page['locator']>) => {
    n += 1;
    if (size === 'phone') await loc.tap();
    else await loc.click();
  };
  return {
    count: () => n,
    press,
    fill: async (loc: ReturnType<Page['locator']>, value: string) => {
      n += 1;
      await loc.fill(value);
    },
    key: async (key: string) => {
      n += 1;
      await page.keyboard.press(key);
    },
  };
}

/** The three copy buttons lie inside the viewport, as the page stands (no scrolling by the test). */
async function copyButtonsInView(page: Page) {
  const height = page.viewportSize()!.height;
  const width = page.viewportSize()!.width;
  for (const name of ['Copy line', 'Copy note', 'Copy handover']) {
    const box = await page.getByRole('button', { name, exact: true }).boundingBox();
    expect(box, name).not.toBeNull();
    expect(box!.y, `${name} top`).toBeGreaterThanOrEqual(0);
    expect(box!.y + box!.height, `${name} bottom`).toBeLessThanOrEqual(height);
    expect(box!.x + box!.width, `${name} right`).toBeLessThanOrEqual(width);
  }
}

/** axe with the WCAG 2.2 AA tags, every impact level. */
async function axe22(s: Session, label: string) {
  await s.axe(label, ['wcag2a', 'wcag2aa', 'wcag21aa', 'wcag22aa']);
}

const clipboard = (page: Page) => page.evaluate(() => navigator.clipboard.readText());

/** No style or script refused by the page's CSP, and nothing asked of any other origin. */
async function closeChecked(s: Session) {
  expect(await s.cspViolations()).toEqual([]);
  const origin = new URL(s.page.url()).origin;
  expect(s.requests.filter((u) => !u.startsWith(origin))).toEqual([]);
  await s.context.close();
}

/** Every control a finger uses is at least 44 px tall and wide (WCAG 2.5.5's size; 2.5.8 asks 24). */
async function tapTargets(page: Page) {
  const small = await page.evaluate(() => {
    const out: string[] = [];
    const controls = document.querySelectorAll(
      'button, select, input:not([type="hidden"]):not([type="radio"]), summary, .option, a.button, textarea',
    );
    for (const el of controls) {
      const box = el.getBoundingClientRect();
      if (box.width === 0 || box.height === 0) continue; // not shown
      if (el.closest('.visually-hidden, .default-submit, [hidden]')) continue;
      if (box.height < 44 || box.width < 44)
        out.push(`${el.tagName} ${el.textContent?.trim().slice(0, 30)} ${box.width}x${box.height}`);
    }
    return out;
  });
  expect(small).toEqual([]);
}

/** Number fields side by side line up, however their labels wrap. */
async function inputsInLine(page: Page) {
  const misaligned = await page.evaluate(() => {
    const boxes = [...document.querySelectorAll('.entry--open .fields input.number')].map((el) =>
      el.getBoundingClientRect(),
    );
    const out: string[] = [];
    for (const a of boxes)
      for (const b of boxes)
        if (a !== b && a.top < b.bottom && b.top < a.bottom && Math.abs(a.top - b.top) > 1)
          out.push(`${a.top} vs ${b.top}`);
    return out;
  });
  expect(misaligned).toEqual([]);
}

/** The page keeps its width: nothing wider than the viewport. */
const pageWidth = (page: Page) => page.evaluate(() => document.documentElement.scrollWidth);

describe.skipIf(!run)('a conversation, not a form', { timeout: 120_000 }, () => {
  let h: Harness;
  const counts: Record<string, number> = {};
  beforeAll(async () => {
    h = await startHarness();
  });
  afterAll(async () => {
    if (Object.keys(counts).length)
      writeFileSync(`${SCREENSHOTS}action-counts.json`, `${JSON.stringify(counts, null, 2)}\n`);
    await h?.close();
  });

  for (const size of ['desktop', 'phone'] as const) {
    it(`${size}: a typed arterial gas reaches a copied line in at most 6 actions, and the draft grows`, async () => {
      const s = await openSession(h, `typed-${size}`, SIZES[size]);
      const { page } = s;
      const act = counter(page, size);
      await page.goto(`${h.origin}/`);
      const width = await pageWidth(page);
      expect(width).toBeLessThanOrEqual(SIZES[size].viewport.width);
      await axe22(s, 'sample');
      await s.shot('sample', { full: false });
      await act.press(page.getByRole('button', { name: 'Arterial' }));
      await waitOpen(page, 'gas');
      await expect.poll(() => page.evaluate(() => document.activeElement?.id)).toBe('f-gas-ph');
      await act.fill(num(page, 'pH'), '7.24');
      await act.fill(num(page, 'PaCO2'), '30');
      await act.fill(num(page, 'HCO3'), '12.6');
      await axe22(s, 'gas');
      await s.shot('gas', { full: false });
      await act.press(page.getByRole('button', { name: 'Next', exact: true }));
      // the draft is there right after the gas, with the next question and why
      await waitOpen(page, 'chemistry');
      await page.locator('#draft').waitFor();
      const line = (await page.locator('#line-text').textContent())!.trim();
      expect(line).toMatch(/metabolic acidosis/i);
      expect(await page.locator('.entry--reply .next').textContent()).toContain(
        'Next, chemistry: a metabolic acidosis: Na, Cl and albumin give the anion gap',
      );
      await expect
        .poll(() => page.evaluate(() => document.activeElement?.id))
        .toBe('f-chemistry-na');
      await copyButtonsInView(page);
      expect(await pageWidth(page)).toBe(width);
      await inputsInLine(page);
      if (size === 'phone') await tapTargets(page);
      await axe22(s, 'draft after gas');
      await s.shot('draft-after-gas', { full: false });
      await act.press(page.getByRole('button', { name: 'Copy line', exact: true }));
      expect(await clipboard(page)).toBe(line);
      counts[`typed arterial gas to copied line, ${size}`] = act.count();
      expect(act.count()).toBeLessThanOrEqual(6);

      // the chemistry: an albumin typed in g/L under g/dL is offered the switch, one press
      await num(page, 'Na').fill('138');
      await num(page, 'Cl').fill('101');
      await num(page, 'Albumin').fill('40');
      await page.getByRole('button', { name: 'Next', exact: true }).click();
      const switchButton = page.getByRole('button', { name: 'This looks like g/L: switch' });
      await switchButton.waitFor();
      await expect
        .poll(() => page.evaluate(() => document.activeElement?.textContent))
        .toBe('This looks like g/L: switch');
      expect(await page.locator('.doubt-text').textContent()).toContain(
        'Albumin 40 g/dL is not a believable result in g/dL; it looks like g/L.',
      );
      await axe22(s, 'unit doubt');
      await s.shot('unit-doubt', { full: false });
      await switchButton.click();
      await page.locator('#step-chemistry.entry--said').waitFor();
      expect(await page.locator('#step-chemistry').textContent()).toContain('Albumin 40 g/L');
      await copyButtonsInView(page);
      await axe22(s, 'after chemistry');
      await s.shot('after-chemistry', { full: false });

      // the clinician edits the note, then changes an answer: the edits stay, the new draft is one press away
      const edited = `${await page.locator('#note-text').inputValue()}\nSeen with the night registrar.`;
      await page.locator('#note-text').fill(edited);
      await page.getByRole('button', { name: /^Edit Gas/ }).click();
      await waitOpen(page, 'gas');
      await page.locator('#f-gas-ph').fill('7.20');
      await page.locator('#f-gas-ph').press('Enter');
      await page.locator('#kept:not([hidden])').waitFor();
      expect(await page.locator('#note-text').inputValue()).toBe(edited);
      expect(await page.locator('#kept').textContent()).toContain(
        'Your edits of the note are kept',
      );
      await axe22(s, 'kept edits');
      await s.shot('kept-edits', { full: false });
      await page.getByRole('button', { name: 'Use the new draft' }).click();
      expect(await page.locator('#note-text').inputValue()).not.toContain('night registrar');
      expect(await page.locator('#note-text').inputValue()).toContain('pH 7.20');

      // Escape skips a step; Finish asks nothing more and puts the focus on the draft
      await page.locator('#step-chemistry').waitFor();
      const open = await page.locator('li.entry--open').getAttribute('id');
      await page.locator('li.entry--open input:not([type=hidden])').first().focus();
      await page.keyboard.press('Escape');
      await expect.poll(() => page.locator('li.entry--open').getAttribute('id')).not.toBe(open);
      await page.getByRole('button', { name: /^Finish/ }).click();
      await expect.poll(() => page.evaluate(() => document.activeElement?.id)).toBe('draft-title');
      expect(await page.locator('li.entry--open').count()).toBe(0);
      expect(await page.locator('.entry--reply .next').textContent()).toContain(
        'Nothing more to ask',
      );
      await copyButtonsInView(page);
      if (size === 'phone') await tapTargets(page);
      await axe22(s, 'finished');
      await s.shot('finished', { full: false });
      await s.shot('finished-whole');
      expect(await pageWidth(page)).toBe(width);

      // the full reasoning is one toggle away; the caution stays on screen
      await page.getByText('Full reasoning', { exact: true }).click();
      expect(await page.locator('#note-full').isVisible()).toBe(true);
      expect(await page.locator('.draft-head .caution').isVisible()).toBe(true);
      await closeChecked(s);
    });

    it(`${size}: a pasted printout reaches a copied line in at most 4 actions`, async () => {
      const s = await openSession(h, `pasted-${size}`, SIZES[size]);
      const { page } = s;
      const act = counter(page, size);
      await page.goto(`${h.origin}/`);
      const printout = [
        'ARTERIAL BLOOD GAS   Bed 4',
        'pH        7.29',
        'pCO2      6.8 kPa',
        'pO2       9.1 kPa',
        'HCO3-     24.1 mmol/L',
        'Lactate   1.4 mmol/L',
      ].join('\n');
      await act.fill(page.getByLabel('Or paste the results'), printout);
      await s.shot('pasted', { full: false });
      await act.press(page.getByRole('button', { name: 'Read the pasted text' }));
      await page.locator('#step-paste').waitFor();
      await axe22(s, 'paste read');
      await s.shot('paste-read', { full: false });
      await act.press(page.getByRole('button', { name: 'Use these values' }));
      await page.locator('#draft').waitFor();
      await copyButtonsInView(page);
      await axe22(s, 'paste used');
      await s.shot('paste-used', { full: false });
      const line = (await page.locator('#line-text').textContent())!.trim();
      expect(line).toMatch(/respiratory acidosis/i);
      await act.press(page.getByRole('button', { name: 'Copy line', exact: true }));
      expect(await clipboard(page)).toBe(line);
      counts[`pasted printout to copied line, ${size}`] = act.count();
      expect(act.count()).toBeLessThanOrEqual(4);
      await closeChecked(s);
    });

    it(`${size}: a follow-up gas reaches a copied line in at most 5 actions, with its own time and what changed`, async () => {
      const s = await openSession(h, `followup-${size}`, SIZES[size]);
      const { page } = s;
      await page.goto(`${h.origin}/`);
      // the first gas, on a ventilator at RR 22 (not counted: the follow-up starts from a draft)
      await page.getByRole('button', { name: 'Arterial' }).click();
      await waitOpen(page, 'gas');
      await num(page, 'pH').fill('7.22');
      await num(page, 'PaCO2').fill('61');
      await num(page, 'HCO3').fill('24.3');
      await num(page, 'HCO3').press('Enter');
      await waitOpen(page, 'chemistry');
      await page.keyboard.press('Escape');
      await waitOpen(page, 'timing');
      await page.getByLabel('Acute (hours)').check();
      await page.getByRole('button', { name: 'Next', exact: true }).click();
      await waitOpen(page, 'oxygen');
      await num(page, 'FiO2').fill('0.4');
      await page.getByLabel('Yes', { exact: true }).check();
      await page.getByRole('button', { name: 'Next', exact: true }).click();
      await waitOpen(page, 'ventilator');
      await num(page, 'VT').fill('450');
      await num(page, 'RR').fill('22');
      await page.getByRole('button', { name: /^Finish/ }).click();
      await expect.poll(() => page.locator('li.entry--open').count()).toBe(0);
      await s.shot('first-gas', { full: false });

      const act = counter(page, size);
      await act.fill(page.locator('#followup-gas-ph'), '7.31');
      await act.fill(page.locator('#followup-gas-pco2'), '49');
      await act.fill(page.locator('#followup-gas-hco3'), '24.6');
      const when = await page.locator('#followup-when').inputValue();
      expect(when).toMatch(/^\d{4}-\d{2}-\d{2} \d{2}:\d{2}$/); // the browser's own time, unless changed
      await act.press(page.getByRole('button', { name: 'Add the later gas' }));
      await page.locator('.entry--earlier').waitFor();
      await copyButtonsInView(page);
      await axe22(s, 'follow-up gas');
      await s.shot('followup-gas', { full: false });
      const line = (await page.locator('#line-text').textContent())!.trim();
      await act.press(page.getByRole('button', { name: 'Copy line', exact: true }));
      expect(await clipboard(page)).toBe(line);
      counts[`follow-up gas to copied line, ${size}`] = act.count();
      expect(act.count()).toBeLessThanOrEqual(5);

      // the earlier gas keeps its own label; the new gas has the time given
      expect(await page.locator('.entry--earlier').textContent()).toContain('first gas');
      expect(await page.locator('.draft-when').textContent()).toContain(when);
      expect(await page.locator('.entry--reply .changes').textContent()).toContain(
        'pH 7.22 to 7.31; PaCO2 61 to 49 mmHg',
      );
      // the settings for the new gas: the rate went up from 22 to 28
      await waitOpen(page, 'oxygen');
      await page.getByRole('button', { name: 'Next', exact: true }).click();
      await waitOpen(page, 'ventilator');
      expect(await num(page, 'RR').inputValue()).toBe('22');
      await num(page, 'RR').fill('28');
      await num(page, 'RR').press('Enter');
      await expect
        .poll(() => page.locator('.entry--reply .changes').textContent())
        .toContain('Changed: RR 22 to 28/min');
      await copyButtonsInView(page);
      await axe22(s, 'what changed');
      await s.shot('what-changed', { full: false });

      // print: the date and time drafted, "draft: decision support" and page numbers, to PDF
      await page.emulateMedia({ media: 'print' });
      expect(await page.locator('.print-head').isVisible()).toBe(true);
      expect(await page.locator('.print-head').textContent()).toMatch(
        /draft: decision support · drafted \d{4}-\d{2}-\d{2} \d{2}:\d{2}/,
      );
      const pdf = `${SCREENSHOTS}followup-${size}-print.pdf`;
      await page.pdf({ path: pdf, format: 'A4' });
      const bytes = (await import('node:fs')).readFileSync(pdf);
      expect(bytes.subarray(0, 5).toString()).toBe('%PDF-');
      if (existsSync('/usr/bin/pdftotext')) {
        const text = execFileSync('/usr/bin/pdftotext', ['-layout', pdf, '-']).toString();
        expect(text).toContain('draft: decision support');
        expect(text).toMatch(/Page 1 of \d/);
        expect(text).toContain(line.slice(0, 20));
      }
      await page.emulateMedia({ media: 'screen' });
      await closeChecked(s);
    });
  }
});
