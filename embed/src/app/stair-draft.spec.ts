import { describe, expect, it } from 'vitest';
import { EMPTY_DRAFT, fieldOfPath, listAttribute, readDraft, type StairDraft } from './stair-draft.js';

// demo-scenario.md: an Alder Row townhouse stair, 14 treads of 900 mm, riser 185, going 250.
const alderRow: StairDraft = { ...EMPTY_DRAFT, treads: '14', treadWidthMm: '900', riserHeightMm: '185', goingMm: '250' };

describe('readDraft', () => {
  it('waits quietly while a required measurement is still empty', () => {
    const reading = readDraft({ ...alderRow, goingMm: '' });
    expect(reading.request).toBeNull();
    expect(reading.missing).toEqual(['goingMm']);
    expect(reading.errors).toEqual({});
  });

  it('turns a complete stair into a kit-options request for three kits', () => {
    expect(readDraft(alderRow).request).toEqual({
      layout: 'tread-strips',
      staircase: { treads: 14, treadWidthMm: 900, riserHeightMm: 185, goingMm: 250 },
      limit: 3,
    });
  });

  it('names what is wrong with a field in plain words', () => {
    const reading = readDraft({ ...alderRow, treads: '14.5', riserHeightMm: '-3' });
    expect(reading.request).toBeNull();
    expect(reading.errors.treads).toMatch(/whole number of treads/);
    expect(reading.errors.riserHeightMm).toBe('Enter a number above zero.');
  });

  it('reads flights foot first with the landing length on each landing, and checks they add up', () => {
    const corner = readDraft({ ...alderRow, treads: '15', flights: '7 + 8', landingLengthMm: '1800' });
    expect(corner.request?.staircase.flights).toEqual([{ treads: 7, landingLengthMm: 1800 }, { treads: 8 }]);
    const wrong = readDraft({ ...alderRow, flights: '7 + 8' });
    expect(wrong.request).toBeNull();
    expect(wrong.errors.flights).toBe('The flights add up to 15 treads, but the stair has 14.');
  });

  it('asks for the chosen strip only, or for the strips the shop offers', () => {
    expect(readDraft({ ...alderRow, stripSku: 'HL-S12-07' }, ['HL-S24-10']).request?.constraints).toEqual({ stripSkus: ['HL-S12-07'] });
    expect(readDraft(alderRow, ['HL-S24-10', 'HL-S12-07']).request?.constraints).toEqual({ stripSkus: ['HL-S24-10', 'HL-S12-07'] });
  });
});

describe('fieldOfPath and listAttribute', () => {
  it('maps API field errors to the form field they are about', () => {
    expect(fieldOfPath('staircase.riserHeightMm')).toBe('riserHeightMm');
    expect(fieldOfPath('staircase.flights.1.treads')).toBe('flights');
    expect(fieldOfPath('limit')).toBeUndefined();
  });

  it('splits an attribute on spaces and commas', () => {
    expect(listAttribute(' HL-S24-10, HL-S12-07 ')).toEqual(['HL-S24-10', 'HL-S12-07']);
    expect(listAttribute(null)).toEqual([]);
  });
});
