import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import pdfmake from 'pdfmake';
import { woffToSfnt } from './woff.js';

/**
 * Fira Sans for the PDF, embedded from @fontsource/fira-sans. That package ships the font cut into
 * Unicode subsets (WOFF files, unwrapped once to TrueType: see woff.ts), so a text is set in runs: each
 * character in the subset that holds it. Characters no subset holds (arrows, ≤) get a plain
 * spelling, so nothing prints as an empty box.
 */

const require = createRequire(import.meta.url);

/** The subsets embedded, most used first: a character takes the first that covers it. */
const SUBSETS = ['latin', 'latin-ext', 'greek', 'cyrillic'] as const;
type Subset = (typeof SUBSETS)[number];
const WEIGHTS = { normal: 400, bold: 600 } as const;

export const FONT_FAMILY = 'FiraSans';
const family = (subset: Subset) => (subset === 'latin' ? FONT_FAMILY : `${FONT_FAMILY}-${subset}`);

/** `U+0000-00FF,U+0131` as code point ranges. */
function parseRanges(spec: string): [number, number][] {
  return spec.split(',').map((part) => {
    const [from, to] = part.trim().replace(/^U\+/i, '').split('-');
    return [parseInt(from, 16), parseInt(to ?? from, 16)];
  });
}

const RANGES: [Subset, [number, number][]][] = (() => {
  const unicode = JSON.parse(readFileSync(require.resolve('@fontsource/fira-sans/unicode.json'), 'utf8')) as Record<string, string>;
  return SUBSETS.map((s) => [s, parseRanges(unicode[s] ?? '')]);
})();

function subsetOf(codePoint: number): Subset | null {
  for (const [subset, ranges] of RANGES) if (ranges.some(([a, b]) => codePoint >= a && codePoint <= b)) return subset;
  return null;
}

/** Plain spellings of the signs the engine's texts use that Fira Sans's subsets lack. */
const SPELLED: Record<string, string> = {
  '→': '->',
  '←': '<-',
  '↔': '<->',
  '≤': '<=',
  '≥': '>=',
  '≠': '!=',
  '≈': '~',
  '√': 'sqrt',
  '∞': 'inf',
  '⌈': 'ceil(',
  '⌉': ')',
  '⌊': 'floor(',
  '⌋': ')',
  '∑': 'sum',
  '∆': 'delta',
  '✓': 'ok',
};

/** A text run in one font family, as pdfmake takes inline text. */
export interface TextRun {
  text: string;
  font?: string;
}

/** The text split into runs by subset; characters of no subset are spelt out or become "?". */
export function textRuns(text: string): TextRun[] {
  const chunks: { subset: Subset; text: string }[] = [];
  for (const char of text) {
    const found = subsetOf(char.codePointAt(0)!);
    const subset = found ?? 'latin';
    const printed = found ? char : (SPELLED[char] ?? char.normalize('NFKD').replace(/[\u0300-\u036f]/g, '').replace(/[^\u0000-\u00ff]/g, '?'));
    const last = chunks.at(-1);
    if (last && last.subset === subset) last.text += printed;
    else chunks.push({ subset, text: printed });
  }
  return chunks.map(runOf);
}

function runOf(run: { subset: Subset; text: string }): TextRun {
  return run.subset === 'latin' ? { text: run.text } : { text: run.text, font: family(run.subset) };
}

/** The text as the PDF prints it (the runs joined): what a reader of the PDF finds. */
export function printedText(text: string): string {
  return textRuns(text)
    .map((r) => r.text)
    .join('');
}

let registered = false;

/** Puts the font files into pdfmake's in-memory file system once, and bars it from disk and network. */
export function pdfmakeWithFonts(): typeof pdfmake {
  if (registered) return pdfmake;
  const fonts: Record<string, { normal: string; bold: string; italics: string; bolditalics: string }> = {};
  for (const subset of SUBSETS) {
    const files = Object.fromEntries(
      Object.entries(WEIGHTS).map(([face, weight]) => {
        const name = `fira-sans-${subset}-${weight}-normal.woff`;
        pdfmake.virtualfs.writeFileSync(name, woffToSfnt(readFileSync(require.resolve(`@fontsource/fira-sans/files/${name}`))));
        return [face, name];
      }),
    ) as { normal: string; bold: string };
    // No italic face is embedded: the document never sets italics, and a stray one falls back upright.
    fonts[family(subset)] = { normal: files.normal, bold: files.bold, italics: files.normal, bolditalics: files.bold };
  }
  pdfmake.setFonts(fonts);
  // Every font comes from the virtual file system; the document never loads a URL or a local file.
  pdfmake.setUrlAccessPolicy(() => false);
  pdfmake.setLocalAccessPolicy(() => false);
  registered = true;
  return pdfmake;
}
