import { describe, expect, it } from 'vitest';
import { guardCell, unguardCell, writeCsv } from '../../../shared/tables/csv.js';
import { readCsv } from './estimates.js';

describe('the shared CSV writer', () => {
  it('starts with a UTF-8 byte-order mark and ends every record with CRLF (RFC 4180)', () => {
    const text = writeCsv([
      ['a', 'b'],
      ['c', 'd'],
    ]);
    expect(text).toBe('\uFEFFa,b\r\nc,d\r\n');
    expect(writeCsv([['a']], { byteOrderMark: false })).toBe('a\r\n');
  });

  it('quotes commas, quotes and line breaks so csv-parse reads the text back unchanged', () => {
    const awkward = ['Alder Row, house 12', 'the "corner" unit', 'two\r\nlines', 'plain', 'mm² · €'];
    const text = writeCsv([awkward]);
    expect(text).toContain('"the ""corner"" unit"');
    expect(readCsv(text)).toEqual([awkward]);
  });

  it('guards text that a spreadsheet would run as a formula, and never a number', () => {
    const text = writeCsv([['=HYPERLINK("http://evil.test","x")', '+1', '-2', '@SUM(A1)', '\tx', '\rx', -3, 0.6, true, null, 'safe']]);
    const [cells] = readCsv(text);
    expect(cells).toEqual([`'=HYPERLINK("http://evil.test","x")`, "'+1", "'-2", "'@SUM(A1)", "'\tx", "'\rx", '-3', '0.6', 'true', '', 'safe']);
  });

  it('strips exactly the apostrophe it added, so guarded text survives a round trip', () => {
    for (const text of ['=1+1', "'=1+1", "''=x", "'plain", 'plain', '-', "'"]) {
      expect(unguardCell(guardCell(text))).toBe(text);
    }
    expect(guardCell("'plain")).toBe("'plain"); // an apostrophe before harmless text is the user's own
  });

  it('pads rows to the widest one when asked, so blocks of different widths parse strictly', () => {
    const text = writeCsv([['title'], ['a', 'b', 'c'], [], [1, 2]], { rectangular: true });
    expect(readCsv(text)).toEqual([
      ['title', '', ''],
      ['a', 'b', 'c'],
      ['', '', ''],
      ['1', '2', ''],
    ]);
  });
});
