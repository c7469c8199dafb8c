// Every published source the core cites, named once so that explanations and tests agree.
export const SOURCES = {
  siPressure: 'SI definition: 1 mmHg = 133.322 Pa, so 1 kPa = 7.50062 mmHg',
  molarMass:
    'Molar masses from IUPAC standard atomic weights (each conversion factor is given beside its unit in calc/units.ts)',
  hydrogenIon: 'Definition of pH: [H+] nmol/L = 10^(9 - pH)',
  henderson: 'Henderson equation: [H+] = 24 x PaCO2 / HCO3 (nmol/L, mmHg, mmol/L)',
  hendersonHasselbalch: 'Henderson-Hasselbalch: pH = 6.1 + log10(HCO3 / (0.0307 x PaCO2))',
  commonPractice: 'Common practice',
  berend2014: 'Berend K, de Vries APJ, Gans ROB. N Engl J Med 2014;371:1434-45',
  winters: "Albert MS, Dell RB, Winters RW. Ann Intern Med 1967;66:312-22 (Winters' formula)",
  pregnancy:
    'Common practice (textbook): pregnancy is a physiological chronic respiratory alkalosis, PaCO2 about 28-32 mmHg, HCO3 about 18-22 mmol/L',
  kraut2007: 'Kraut JA, Madias NE. Clin J Am Soc Nephrol 2007;2:162-74',
  figge1998: 'Figge J, Jabor A, Kazda A, Fencl V. Crit Care Med 1998;26:1807-10',
  wrenn1990: 'Wrenn K. Ann Emerg Med 1990;19:1310-13',
  purssell2001: 'Purssell RA et al. Ann Emerg Med 2001;38:653-9',
  ssc2021: 'Surviving Sepsis Campaign 2021: Evans L et al. Crit Care Med 2021;49:e1063-e1143',
  clsiC46: 'Van Slyke equation as given in CLSI C46-A2 (2009)',
  story2004: 'Story DA, Morimatsu H, Bellomo R. Br J Anaesth 2004;92:54-60',
  kellum2005: 'Figge-Fencl strong ion gap, as summarised in Kellum JA. Crit Care 2005;9:500-7',
  isa: 'ICAO standard atmosphere (ISO 2533:1975)',
  alveolarGas: 'Alveolar gas equation (PH2O 47 mmHg at 37 C, RQ 0.8)',
  aaAge: 'Common practice: expected A-a gradient on room air about age/4 + 4 mmHg',
  ardsBerlin: 'ARDS Definition Task Force. JAMA 2012;307:2526-33 (Berlin definition)',
  ardsGlobal2024:
    'Matthay MA et al. Am J Respir Crit Care Med 2024;209:37-47 (global definition of ARDS)',
  oxygenContent: 'Textbook oxygen content: CaO2 = 1.34 x Hb x SaO2 + 0.003 x PaO2',
  byrne2014:
    'Byrne AL et al. Respirology 2014;19:168-75 (venous vs arterial systematic review; figures from memory)',
  ardsnet2000: 'ARDS Network. N Engl J Med 2000;342:1301-08',
  amato2015: 'Amato MBP et al. N Engl J Med 2015;372:747-55',
  west: 'West JB. Respiratory Physiology: alveolar ventilation equation PaCO2 = 0.863 x VCO2 / VA',
  radford1955:
    'Radford EP. J Appl Physiol 1955;7:451-60 (anatomic dead space about 2.2 mL/kg; from memory)',
  sinha2009:
    'Sinha P et al. Am J Respir Crit Care Med 2009;180:1220 (ventilatory ratio; from memory)',
  targetPco2:
    'Henderson equation with acute buffering of 0.1 mmol/L HCO3 per mmHg PaCO2 (Berend 2014 acute rule)',
  katz1973:
    'Katz MA. N Engl J Med 1973;289:843-4 (sodium corrected for hyperglycaemia: 1.6 mmol/L per 100 mg/dL of glucose above 100)',
  hillier1999:
    'Hillier TA, Abbott RD, Barrett EJ. Am J Med 1999;106:399-403 (2.4 mmol/L per 100 mg/dL)',
  kitabchi2009:
    'Kitabchi AE, Umpierrez GE, Miles JM, Fisher JN. Diabetes Care 2009;32:1335-43 (hyperglycaemic crises)',
  jbdsDka:
    'Joint British Diabetes Societies Inpatient Care Group: management of diabetic ketoacidosis in adults (ketones 3 mmol/L or more; potassium before insulin; from memory)',
  btsAsthma:
    'BTS/SIGN British guideline on the management of asthma (SIGN 158, 2019): a normal or raised PaCO2 in acute asthma is life-threatening (from memory)',
  alkalosisCeiling:
    'Common practice (from memory): respiratory compensation for a metabolic alkalosis seldom takes PaCO2 above about 55-60 mmHg',
  btsOxygen:
    "O'Driscoll BR et al. BTS guideline for oxygen use in adults in healthcare and emergency settings. Thorax 2017;72:ii1-ii90 (pregnancy target 95% or more from memory)",
  proseva:
    'Guerin C et al. N Engl J Med 2013;368:2159-68 (PROSEVA: prone positioning 16 h or more a day)',
  bicarIcu:
    'Jaber S et al. Lancet 2018;392:31-40 (BICAR-ICU: sodium bicarbonate in severe metabolic acidaemia)',
  enghoff:
    "Bohr equation with Enghoff's modification: VD/VT = (PaCO2 - PECO2) / PaCO2; with the end-tidal CO2, the alveolar dead-space fraction",
  mechanics:
    'Respiratory-system compliance Crs = VT / (Pplat - PEEP); predicted plateau = PEEP + VT / Crs (ARDS Network 2000 limits)',
  expiratoryTime: 'Expiratory time Te = 60 / RR - Ti (common practice)',
  criticalValues: 'Common practice critical-value defaults (laboratory-specific; configurable)',
} as const;

export type SourceKey = keyof typeof SOURCES;
