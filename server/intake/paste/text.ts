// Text preparation for the paste reader: one character for one character (so a position in the prepared line is
// the same in the original), results copied from a web page as HTML reduced to their text, and numbers as printouts
// write them (a decimal point or a decimal comma).

const CHAR_MAP: Record<string, string> = {
  '\u2212': '-',
  '\u2013': '-',
  '\u2014': '-',
  '\u2010': '-',
  '\u2011': '-',
  '\u00a0': ' ',
  '\u2009': ' ',
  '\u202f': ' ',
  '\u2082': '2',
  '\u2083': '3',
  '\u207b': '-',
  '\u207a': '+',
  '\u00b5': 'u',
  '\u03bc': 'u',
  '\uff05': '%',
  '\u2264': '<',
  '\u2265': '>',
};
export const normalizeChars = (s: string): string =>
  s.replace(
    /[\u2212\u2013\u2014\u2010\u2011\u00a0\u2009\u202f\u2082\u2083\u207b\u207a\u00b5\u03bc\uff05\u2264\u2265]/g,
    (ch) => CHAR_MAP[ch] ?? ch,
  );

// A tag never spans lines here: a stray "<" in a printout ("K <3.0") must not swallow the lines after it.
const HTML_TAG =
  /<\/?(?:html|head|body|table|thead|tbody|tr|td|th|p|div|br|span|li|ul|ol|pre|font|b|strong|em|h[1-6]|section|article|a|img|meta|title|style|script)(?:\s[^<>\n]{0,500})?\/?>/i;
const ANY_TAG =
  /<\/?[A-Za-z][\w-]{0,20}(?:\s[^<>\n]{0,500})?\/?>|<!--[^\n]{0,500}?-->|<!doctype[^<>\n]{0,100}>/gi;

/** Remove <script>...</script> (or style) blocks in one pass. */
function dropBlocks(text: string, tag: 'script' | 'style'): string {
  const lower = text.toLowerCase();
  let out = '';
  let i = 0;
  for (;;) {
    const start = lower.indexOf(`<${tag}`, i);
    const end = start < 0 ? -1 : lower.indexOf(`</${tag}`, start);
    if (start < 0 || end < 0) return out + text.slice(i);
    const close = lower.indexOf('>', end);
    out += `${text.slice(i, start)} `;
    i = close < 0 ? text.length : close + 1;
  }
}

/** Results copied from a web page arrive as HTML: keep the text, one table row per line. */
export function stripHtml(text: string): string {
  if (!HTML_TAG.test(text)) return text;
  return dropBlocks(dropBlocks(text, 'script'), 'style')
    .replace(/<br\s*\/?>/gi, '\n')
    .replace(/<\/(?:p|div|tr|li|h[1-6]|table|title|pre|ul|ol)\s*>/gi, '\n')
    .replace(/<\/(?:td|th)\s*>/gi, '\t')
    .replace(ANY_TAG, '')
    .replace(/&nbsp;/gi, ' ')
    .replace(/&lt;/gi, '<')
    .replace(/&gt;/gi, '>')
    .replace(/&micro;/gi, 'µ')
    .replace(/&#(\d{1,6});/g, (_, d: string) => String.fromCodePoint(Math.min(Number(d), 0x10ffff)))
    .replace(/&amp;/gi, '&');
}

// ---------- numbers ----------

export const NUM = String.raw`\d+(?:[.,]\d+)?`;

/** A decimal comma with one or two digits is a decimal; three digits could be a thousands separator. */
export function parseNumber(token: string): number | 'ambiguous' {
  const comma = /^(\d+),(\d+)$/.exec(token);
  if (comma) return comma[2]!.length === 3 ? 'ambiguous' : Number(`${comma[1]}.${comma[2]}`);
  return Number(token);
}
