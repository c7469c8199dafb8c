// The UNITS setting (the deployment's default units for a new case) and the unit preference kept in the browser.
import { describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';
import { parseUnits } from '../../server/unitsSetting.ts';
import { caseOf, poster, stateOf } from './pageHtml.ts';

describe('parseUnits', () => {
  it('reads a pressure unit, a system and kind=unit, later words winning', () => {
    expect(parseUnits('kPa,SI')).toEqual({
      ok: true,
      units: {
        pressure: 'kPa',
        albumin: 'g/L',
        hb: 'g/L',
        glucose: 'mmol/L',
        urea: 'urea-mmol/L',
        creatinine: 'umol/L',
        ethanol: 'mmol/L',
      },
    });
    expect(parseUnits('mmHg, conventional, albumin=g/L')).toEqual({
      ok: true,
      units: {
        pressure: 'mmHg',
        albumin: 'g/L',
        hb: 'g/dL',
        glucose: 'mg/dL',
        urea: 'bun-mg/dL',
        creatinine: 'mg/dL',
        ethanol: 'mg/dL',
      },
    });
    expect(parseUnits('')).toEqual({ ok: true, units: {} });
  });

  it('names a word it does not know', () => {
    expect(parseUnits('kPa,furlongs')).toEqual({
      ok: false,
      error:
        'UNITS: "furlongs" is not mmHg, kPa, SI, conventional or kind=unit (for example albumin=g/L)',
    });
    expect(parseUnits('albumin=mg/L').ok).toBe(false);
  });
});

describe('the units a new case starts in', () => {
  it('follow UNITS, and then the unit this browser last used', async () => {
    const units = parseUnits('kPa,SI');
    if (!units.ok) throw new Error(units.error);
    const app = createApp({ units: units.units });
    const first = await (await app.request('/')).text();
    expect(caseOf(first).units).toMatchObject({ pressure: 'kPa', albumin: 'g/L' });

    // the clinician answers in mmHg: the answer is remembered as this browser's preference
    const post = poster(app);
    let page = (await post('/step', { ...stateOf(first), step: 'sample', sample: 'arterial' }))
      .html;
    const res = await post('/step', {
      ...stateOf(page),
      step: 'gas',
      action: 'next',
      'units.pressure': 'mmHg',
      'gas.ph': '7.31',
      'gas.pco2': '48',
      'gas.hco3': '23',
    });
    page = res.html;
    const cookie = res.headers.get('set-cookie') ?? '';
    expect(cookie).toMatch(/^gasline-units=[^;]*pressure%3AmmHg/);
    expect(cookie).toMatch(/HttpOnly/);
    expect(cookie).toMatch(/SameSite=Strict/);
    // nothing of the patient is in it: only kinds of value and their units
    expect(decodeURIComponent(cookie.split(';')[0]!)).not.toMatch(/7\.31|48|23/);

    const next = await app.request('/', { headers: { cookie: cookie.split(';')[0]! } });
    expect(caseOf(await next.text()).units).toMatchObject({ pressure: 'mmHg', albumin: 'g/L' });
    // a cookie with a unit the case does not know is read as no preference for that kind
    const odd = await app.request('/', { headers: { cookie: 'gasline-units=pressure%3Atorr' } });
    expect(caseOf(await odd.text()).units).toMatchObject({ pressure: 'kPa' });
  });
});
