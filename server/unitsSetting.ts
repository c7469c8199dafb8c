// The units a new case starts in: the deployment's default (UNITS, for example "kPa,SI"), then the clinician's own
// choice, remembered in this browser as a preference cookie (units are not patient data; nothing else is kept).
// The clinician sees every unit beside its value and can change it at the field.
import type { Context } from 'hono';
import { getCookie, setCookie } from 'hono/cookie';
import { units as U } from '../calc/index.ts';

export type UnitChoices = Partial<Record<U.Quantity, string>>;

const PREFERENCE = 'gasline-units';
const YEAR_S = 365 * 24 * 3600;

// a unit per litre is the SI one; per decilitre the conventional one (as views/fields.ts offers them)
const isSi = (def: U.UnitDef) => /\/L$/.test(def.label);

/** Every kind with a choice, in SI or conventional units. */
function system(si: boolean): UnitChoices {
  const out: UnitChoices = {};
  for (const q of U.QUANTITY_NAMES) {
    if (q === 'pressure') continue;
    const found = Object.entries(U.QUANTITIES[q].units as Record<string, U.UnitDef>).find(
      ([, def]) => isSi(def) === si,
    );
    if (found) out[q] = found[0];
  }
  return out;
}

/**
 * Read a UNITS setting: comma-separated words, each a pressure unit (mmHg, kPa), a system (SI, conventional) or
 * kind=unit (albumin=g/L). Later words win. An unknown word is an error naming it.
 */
export function parseUnits(
  text: string,
): { ok: true; units: UnitChoices } | { ok: false; error: string } {
  let out: UnitChoices = {};
  for (const raw of text.split(',')) {
    const word = raw.trim();
    if (!word) continue;
    if (word === 'mmHg' || word === 'kPa') out.pressure = word;
    else if (/^si$/i.test(word)) out = { ...out, ...system(true) };
    else if (/^conventional$/i.test(word)) out = { ...out, ...system(false) };
    else {
      const [kind, unit] = word.split('=').map((x) => x.trim());
      const q = kind as U.Quantity;
      if (!unit || !U.QUANTITY_NAMES.includes(q) || !(unit in U.QUANTITIES[q].units))
        return {
          ok: false,
          error: `UNITS: "${word}" is not mmHg, kPa, SI, conventional or kind=unit (for example albumin=g/L)`,
        };
      out[q] = unit;
    }
  }
  return { ok: true, units: out };
}

/** Only units the case accepts: a cookie is the browser's to change, so it is read as a hint and checked. */
function checked(given: Record<string, unknown>): UnitChoices {
  const out: UnitChoices = {};
  for (const q of U.QUANTITY_NAMES) {
    const unit = given[q];
    if (typeof unit === 'string' && unit in U.QUANTITIES[q].units) out[q] = unit;
  }
  return out;
}

/** The units a new case starts in: the deployment's default, overridden by this browser's preference. */
export function startingUnits(c: Context, defaults: UnitChoices): UnitChoices {
  const cookie = getCookie(c, PREFERENCE) ?? '';
  const preferred: Record<string, string> = {};
  for (const pair of cookie.split('|')) {
    const [kind, unit] = pair.split(':');
    if (kind && unit) preferred[kind] = unit;
  }
  return { ...defaults, ...checked(preferred) };
}

/** Remember the units of a case in this browser, for the next case. */
export function rememberUnits(c: Context, units: unknown): void {
  if (units === null || typeof units !== 'object') return;
  const chosen = checked(units as Record<string, unknown>);
  const value = Object.entries(chosen)
    .map(([k, v]) => `${k}:${v}`)
    .join('|');
  if (!value || value === getCookie(c, PREFERENCE)) return;
  setCookie(c, PREFERENCE, value, {
    path: '/',
    maxAge: YEAR_S,
    sameSite: 'Strict',
    httpOnly: true,
    secure: new URL(c.req.url).protocol === 'https:',
  });
}
