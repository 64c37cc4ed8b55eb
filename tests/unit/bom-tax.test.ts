import { describe, expect, it } from 'vitest';
import { taxMinor } from '../../shared/sizing/estimate/bom.js';

// Tax on the net total in integer minor units, rounded half up (commercial rounding; common
// practice, no published source — the rate in hundredths of a percent keeps it exact).
describe('tax on a net total', () => {
  it('rounds half a minor unit up and anything less down', () => {
    expect(taxMinor(5, 1000)).toBe(1); // 0.05 × 10 % = 0.005 → 0.01
    expect(taxMinor(4, 1000)).toBe(0); // 0.04 × 10 % = 0.004 → 0.00
    expect(taxMinor(15, 1000)).toBe(2); // 0.15 × 10 % = 0.015 → 0.02
  });

  it('is exact on the demo total and on fractional rates', () => {
    expect(taxMinor(47290, 2000)).toBe(9458); // €472.90 × 20 % = €94.58
    expect(taxMinor(10000, 775)).toBe(775); // €100.00 × 7.75 % = €7.75
    expect(taxMinor(12345, 0)).toBe(0);
  });
});
