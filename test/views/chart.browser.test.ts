// The H+/CO2 chart on the page in headless Chromium, at 1280x900 and at 390x844: open beside the draft on a wide
// screen, folded under its heading on a phone, no text under 11 px as drawn, axe clean, and photographed into
// screenshots/ (regenerate: npx vitest run test/views/chart.browser.test.ts). Every patient is invented.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { createNoteRenderer } from '../../templates/index.ts';
import { flowView, renderPage } from '../../views/render.ts';
import { STEP_IDS } from '../../views/steps.ts';
import {
  SCREENSHOTS,
  browserGate,
  openSession,
  startHarness,
  type Harness,
} from '../e2e/harness.ts';

const CASES = {
  // a 66-year-old ventilated for pneumonia, two earlier gases, target pH 7.35
  ventilated: {
    sample: 'arterial',
    units: { pressure: 'mmHg' },
    gas: { ph: 7.22, pco2: 61, po2: 88, hco3: 24.3 },
    context: { timing: 'acute' },
    oxygen: { fio2: 0.5, peep: 8 },
    ventilator: { vt: 450, rr: 14, targetPh: 7.35 },
    patient: { heightCm: 170, sex: 'male', ageYears: 66 },
    previous: [
      { takenAt: '2026-03-02T03:00', gas: { ph: 7.3, pco2: 50, hco3: 24 } },
      { takenAt: '2026-03-02T05:00', gas: { ph: 7.26, pco2: 55, hco3: 24.1 } },
    ],
  },
  // a 71-year-old with a venous gas, in kPa
  venous: {
    sample: 'venous',
    units: { pressure: 'kPa' },
    gas: { ph: 7.28, pco2: 7.6, hco3: 26 },
    patient: { ageYears: 71 },
  },
  // a 24-year-old with a severe metabolic acidosis
  acidosis: {
    sample: 'arterial',
    units: { pressure: 'mmHg' },
    gas: { ph: 7.12, pco2: 22, hco3: 7 },
    chemistry: { na: 135, cl: 100 },
    patient: { ageYears: 24 },
  },
} as const;

const pageHtml = (answers: unknown) =>
  renderPage(
    flowView({ answers, done: [...STEP_IDS], format: 'text' } as Parameters<typeof flowView>[0], {
      renderer: createNoteRenderer(),
    }),
  );

/** The smallest text in the drawing as the screen shows it: font size times the drawing's scale, in CSS px. */
const smallestTextPx = (page: Page) =>
  page.evaluate(() =>
    Math.min(
      ...[...document.querySelectorAll('#chart svg text')].map(
        (t) =>
          Number.parseFloat(getComputedStyle(t).fontSize) *
          ((t as SVGTextElement).getScreenCTM()?.a ?? 0),
      ),
    ),
  );

const run = browserGate('test/views/chart.browser.test.ts');

describe.skipIf(!run)('the H+/CO2 chart in Chromium', () => {
  let h: Harness;
  beforeAll(async () => {
    h = await startHarness();
  });
  afterAll(async () => {
    await h?.close();
  });

  for (const [name, answers] of Object.entries(CASES)) {
    it(`${name}: open on a wide screen, folded on a phone, no text under 11 px`, async () => {
      const wide = await openSession(h, `chart-${name}-1280`);
      await wide.page.goto(`${h.origin}/`);
      await wide.page.setContent(pageHtml(answers), { waitUntil: 'load' });
      const svg = wide.page.locator('#chart svg');
      await expect.poll(() => svg.isVisible()).toBe(true);
      expect(await wide.page.locator('.chart-fold > summary').isVisible()).toBe(false);
      // in the draft's column, beside the conversation: the chart's left edge is right of the conversation's
      const chartBox = await wide.page.locator('#chart').boundingBox();
      const talkBox = await wide.page.locator('.talk').first().boundingBox();
      expect(chartBox && talkBox && chartBox.x > talkBox.x + talkBox.width - 1).toBe(true);
      expect(await smallestTextPx(wide.page)).toBeGreaterThanOrEqual(11);
      // open to assistive technology too: an image named by its title, and the words' summary
      const tree = await wide.page.locator('#chart').ariaSnapshot();
      expect(tree).toContain('figure "H⁺/CO₂ chart"');
      expect(tree).toContain('img "H⁺/CO₂ chart: [H⁺] against PaCO₂, with lines of equal HCO₃⁻"');
      expect(tree).toContain('group: What the chart shows');
      await wide.axe('chart open');
      await wide.shot('page', { full: false });
      await wide.page
        .locator('#chart')
        .screenshot({ path: `${SCREENSHOTS}chart-${name}-1280-panel.png` });
      await wide.context.close();

      const phone = await openSession(h, `chart-${name}-390`, {
        viewport: { width: 390, height: 844 },
        isMobile: true,
        hasTouch: true,
      });
      await phone.page.goto(`${h.origin}/`);
      await phone.page.setContent(pageHtml(answers), { waitUntil: 'load' });
      const fold = phone.page.locator('.chart-fold > summary');
      expect(await phone.page.locator('#chart svg').isVisible()).toBe(false);
      expect(await fold.isVisible()).toBe(true);
      expect((await fold.boundingBox())?.height).toBeGreaterThanOrEqual(44);
      await phone.axe('chart folded');
      await fold.scrollIntoViewIfNeeded();
      await phone.shot('folded', { full: false });
      await fold.click();
      await expect.poll(() => phone.page.locator('#chart svg').isVisible()).toBe(true);
      expect(await smallestTextPx(phone.page)).toBeGreaterThanOrEqual(11);
      // the drawing fits the phone's width: no sideways scrolling
      expect(
        await phone.page.evaluate(() => document.documentElement.scrollWidth),
      ).toBeLessThanOrEqual(390);
      await phone.page.locator('.chart-words > summary').click();
      await phone.axe('chart and words open');
      await phone.page
        .locator('#chart')
        .screenshot({ path: `${SCREENSHOTS}chart-${name}-390-panel.png` });
      await phone.context.close();
    });
  }
});
