// Paste intake: an analyser printout, lab result lines or the trade shorthand pH/PaCO2/PaO2/HCO3 as text
// -> a draft case, what was read (to confirm), what must be asked, and what was left unused.
// Pure: no I/O. A value is filled only when its field and unit are clear; anything else becomes a question.
// Units stay as the clinician's printout gives them (the case's units group); calc converts once, at its edge.
// The one exception is a unit the case has no choice for: mEq/L of a divalent ion is read into mmol/L by calc's
// readUnit, and says so.
import { missingGas } from '../case.ts';
import { collect } from './collect.ts';
import { resolve } from './decide.ts';
import { MAX_PASTE_CHARS, type PasteResult } from './types.ts';

export function parsePaste(text: string): PasteResult {
  const input = String(text ?? '');
  const result: PasteResult = {
    case: { gas: {} },
    read: [],
    questions: [],
    ignored: [],
    skipped: [],
    missing: [],
  };
  if (input.length > MAX_PASTE_CHARS) {
    result.questions.push({
      path: '(text)',
      reason: `The text is longer than ${MAX_PASTE_CHARS} characters: paste the result lines only`,
    });
    result.missing = missingGas(result.case);
    return result;
  }
  resolve(collect(input), result);
  return result;
}
