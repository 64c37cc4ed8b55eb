import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { woffToSfnt } from '../../../api/exports/woff.js';

const require = createRequire(import.meta.url);
const woff = readFileSync(require.resolve('@fontsource/fira-sans/files/fira-sans-latin-400-normal.woff'));

/** OpenType spec, "Calculating checksums": the sum of the table's big-endian uint32 words, zero-padded. */
function tableChecksum(data: Buffer): number {
  const padded = Buffer.concat([data, Buffer.alloc((4 - (data.length % 4)) % 4)]);
  let sum = 0;
  for (let i = 0; i < padded.length; i += 4) sum = (sum + padded.readUInt32BE(i)) >>> 0;
  return sum;
}

describe('unwrapping the WOFF font files', () => {
  it('gives an sfnt whose every table matches the checksum the font carries', () => {
    const sfnt = woffToSfnt(woff);
    expect(sfnt.readUInt32BE(0)).toBe(woff.readUInt32BE(4)); // the WOFF flavor is the sfnt version
    const numTables = sfnt.readUInt16BE(4);
    expect(numTables).toBe(woff.readUInt16BE(12));
    // WOFF 1.0 §5: the header's totalSfntSize is the size of the unwrapped font.
    expect(sfnt.length).toBe(woff.readUInt32BE(16));
    const tags: string[] = [];
    for (let i = 0; i < numTables; i++) {
      const at = 12 + i * 16;
      const tag = sfnt.toString('latin1', at, at + 4);
      tags.push(tag);
      const data = sfnt.subarray(sfnt.readUInt32BE(at + 8), sfnt.readUInt32BE(at + 8) + sfnt.readUInt32BE(at + 12));
      // 'head' holds checkSumAdjustment, which its own checksum is computed without.
      const checked = tag === 'head' ? Buffer.concat([data.subarray(0, 8), Buffer.alloc(4), data.subarray(12)]) : data;
      expect(tableChecksum(checked), tag).toBe(sfnt.readUInt32BE(at + 4));
    }
    expect(tags).toEqual(expect.arrayContaining(['cmap', 'glyf', 'head', 'hmtx', 'name']));
  });

  it('refuses what is not WOFF 1.0', () => {
    expect(() => woffToSfnt(Buffer.from('wOF2....'))).toThrow(/not a WOFF/);
  });
});
