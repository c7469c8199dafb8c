// Standard base excess, the simplified physicochemical partition, and the strong ion gap.

// Van Slyke equation (CLSI C46-A2, 2009): SBE = 0.93 x (HCO3 - 24.4 + 14.8 x (pH - 7.40)).
export const standardBaseExcess = (ph: number, hco3: number): number =>
  0.93 * (hco3 - 24.4 + 14.8 * (ph - 7.4));

export interface Partition {
  sodiumChloride: number;
  albumin: number;
  unmeasured: number;
}

// Story, Morimatsu and Bellomo 2004: Na-Cl effect = Na - Cl - 38; albumin effect = 0.25 x (42 - albumin g/L);
// unmeasured-ion effect = SBE - (Na-Cl effect) - (albumin effect).
export function physicochemicalPartition(
  sbe: number,
  na: number,
  cl: number,
  albuminGdl: number,
): Partition {
  const sodiumChloride = na - cl - 38;
  const albumin = 0.25 * (42 - albuminGdl * 10);
  return { sodiumChloride, albumin, unmeasured: sbe - sodiumChloride - albumin };
}

export interface StrongIons {
  na: number;
  k: number;
  ionisedCalcium: number;
  magnesium: number;
  cl: number;
  lactate: number;
}

// Apparent strong ion difference: SIDa = Na + K + 2 iCa + 2 Mg - Cl - lactate (Figge-Fencl; Kellum 2005).
export const apparentStrongIonDifference = (s: StrongIons): number =>
  s.na + s.k + 2 * s.ionisedCalcium + 2 * s.magnesium - s.cl - s.lactate;

// Effective SID: HCO3 + albumin g/L x (0.123 pH - 0.631) + phosphate x (0.309 pH - 0.469) (Figge-Fencl; Kellum 2005).
export const effectiveStrongIonDifference = (
  hco3: number,
  albuminGdl: number,
  phosphate: number,
  ph: number,
): number => hco3 + albuminGdl * 10 * (0.123 * ph - 0.631) + phosphate * (0.309 * ph - 0.469);

// Strong ion gap = SIDa - SIDe (Kellum 2005).
export const strongIonGap = (sida: number, side: number): number => sida - side;
