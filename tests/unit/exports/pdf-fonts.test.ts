import { describe, expect, it } from 'vitest';
import { FONT_FAMILY, printedText, textRuns } from '../../../api/exports/pdf-fonts.js';

describe('setting text in the Fira Sans subsets', () => {
  it('keeps plain Latin text, units and the euro sign in one run of the main face', () => {
    expect(textRuns('0.5 mm², 39.00 €, 16.48 µs, 24 V – the installer’s “note”')).toEqual([{ text: '0.5 mm², 39.00 €, 16.48 µs, 24 V – the installer’s “note”' }]);
  });

  it('sets letters of other subsets in the face that holds them (unicode ranges of @fontsource/fira-sans)', () => {
    expect(textRuns('Łódź')).toEqual([
      { text: 'Ł', font: `${FONT_FAMILY}-latin-ext` }, // U+0141: latin-ext
      { text: 'ód' }, // U+00F3 and d: latin
      { text: 'ź', font: `${FONT_FAMILY}-latin-ext` }, // U+017A: latin-ext
    ]);
    expect(textRuns('cos φ')).toEqual([{ text: 'cos ' }, { text: 'φ', font: `${FONT_FAMILY}-greek` }]);
  });

  it('spells out signs no subset holds, so none prints as an empty box', () => {
    expect(printedText('driver → feeder, I_B ≤ I_n ≥ 1 ≈ 2')).toBe('driver -> feeder, I_B <= I_n >= 1 ~ 2');
    expect(printedText('☃')).toBe('?');
  });
});
