// A venous PCO2 is judged against the compensation rules by its arterial estimate (Byrne AL et al.,
// Respirology 2014: venous PCO2 about 4-6 mmHg above arterial; figures from memory).
import { describe, expect, it } from 'vitest';
import { interpret, type Findings } from '../../calc/index.ts';

const read = (c: unknown): Findings => {
  const f = interpret(c);
  if (!f.ok) throw new Error(JSON.stringify(f.errors));
  return f;
};
const named = (f: Findings) => f.disorders.map((d) => d.code);

// Invented: a 19-year-old in the emergency department with ketoacidosis, venous gas.
const ketoacidosis = {
  gas: { ph: 7.15, pco2: 25, hco3: 8.5 },
  chemistry: { na: 134, cl: 98, albumin: 4.2 },
};

describe('venous compensation judgement', () => {
  it('Winters 1.5 x 8.5 + 8 = 20.75 +/- 2: a venous PCO2 of 25 (arterial about 19-21) fits it', () => {
    const f = read({ ...ketoacidosis, sample: 'venous' });
    expect(f.compensation).toMatchObject({
      rule: 'winters',
      expected: { low: 18.75, high: 22.75 },
      verdict: 'within',
      pco2Basis: 'venous_estimate',
    });
    expect(named(f)).toEqual(['metabolic_acidosis']);
  });

  it('the same numbers as an arterial gas are judged as measured', () => {
    const f = read({ ...ketoacidosis, sample: 'arterial', gas: { ph: 7.1, pco2: 28, hco3: 8.5 } });
    // arterial PaCO2 28 > 22.75: added respiratory acidosis (Albert, Dell and Winters 1967)
    expect(f.compensation).toMatchObject({ verdict: 'above', pco2Basis: 'measured' });
    expect(named(f)).toEqual(['metabolic_acidosis', 'respiratory_acidosis']);
  });

  it('a venous PCO2 well above the band still names the added respiratory acidosis', () => {
    // venous 34 -> arterial about 28-30, all above 1.5 x 9.2 + 8 + 2 = 23.8
    const f = read({ ...ketoacidosis, sample: 'venous', gas: { ph: 7.05, pco2: 34, hco3: 9.2 } });
    expect(named(f)).toContain('respiratory_acidosis');
  });

  it('no added respiratory alkalosis on an estimate alone: venous 38 (arterial 32-38) against Winters 36.8 +/- 2', () => {
    // invented: an elderly woman with sepsis in the emergency department; 1.5 x 19.2 + 8 = 36.8
    const f = read({ sample: 'venous', gas: { ph: 7.32, pco2: 38, hco3: 19.2 } });
    expect(f.compensation?.verdict).toBe('within');
    expect(named(f)).toEqual(['metabolic_acidosis']);
  });

  it('a very low venous PCO2 is judged as measured (no negative arterial estimate)', () => {
    const f = read({ sample: 'venous', gas: { ph: 7.5, pco2: 12, hco3: 9.4 } });
    expect(f.compensation?.pco2Basis).toBe('measured');
    expect(f.venous?.arterialEstimate).toBeNull();
  });
});

describe('a ventilator target below any plausible PaCO2', () => {
  it('target pH 7.60 at HCO3 6.1: PaCO2_t = 25.1 x (6.1 - 2.0) / (24 - 2.51) = 4.8 mmHg, below the 20 mmHg floor: not reachable', () => {
    const f = read({
      gas: { ph: 7.1, pco2: 20, hco3: 6.1 },
      patient: { sex: 'male', heightCm: 180 },
      ventilator: { vt: 500, rr: 20, targetPh: 7.6 },
    });
    expect(f.flags.find((x) => x.code === 'target_not_reachable')?.values).toMatchObject({
      targetPh: 7.6,
    });
    // a metabolic acidosis: the target is Winters' 1.5 x 6.1 + 8 = 17.2 instead (Albert 1967),
    expect(f.derived.targetPco2).toBe(17.2);
    expect(f.ventilation?.targetBasis).toBe('compensation');
  });
});
