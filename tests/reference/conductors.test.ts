import { unit, type Unit } from 'mathjs';
import { describe, expect, it } from 'vitest';
import { copperAlphaAt, correctForTemperature, resistanceOhmPerKm } from '../../shared/sizing/conductors.js';
import { CONDUCTOR_TABLES, awgAreaMm2, awgDiameterMm } from '../../shared/tables/conductors.js';

const M_PER_FT = 0.3048; // exact by definition (international foot, 1959)
const toOhmPerKft = (ohmPerKm: number) => ohmPerKm * M_PER_FT;

describe('IEC 60228 maximum DC resistance at 20 °C', () => {
  // [mm², Ω/km] — IEC 60228 values as tabulated in the team handbook (domain.md).
  const class5: Array<[number, number]> = [
    [0.5, 39.0], // IEC 60228, class 5, 0.5 mm²: 39.0 Ω/km
    [0.75, 26.0], // IEC 60228, class 5, 0.75 mm²: 26.0 Ω/km
    [1.0, 19.5], // IEC 60228, class 5, 1.0 mm²: 19.5 Ω/km
    [1.5, 13.3], // IEC 60228, class 5, 1.5 mm²: 13.3 Ω/km
    [2.5, 7.98], // IEC 60228, class 5, 2.5 mm²: 7.98 Ω/km
    [4, 4.95], // IEC 60228, class 5, 4 mm²: 4.95 Ω/km
    [6, 3.3], // IEC 60228, class 5, 6 mm²: 3.30 Ω/km
  ];
  const class12: Array<[number, number]> = [
    [0.5, 36.0], // IEC 60228, class 1/2, 0.5 mm²: 36.0 Ω/km
    [0.75, 24.5], // IEC 60228, class 1/2, 0.75 mm²: 24.5 Ω/km
    [1.0, 18.1], // IEC 60228, class 1/2, 1.0 mm²: 18.1 Ω/km
    [1.5, 12.1], // IEC 60228, class 1/2, 1.5 mm²: 12.1 Ω/km
    [2.5, 7.41], // IEC 60228, class 1/2, 2.5 mm²: 7.41 Ω/km
    [4, 4.61], // IEC 60228, class 1/2, 4 mm²: 4.61 Ω/km
    [6, 3.08], // IEC 60228, class 1/2, 6 mm²: 3.08 Ω/km
  ];
  const class5Tinned: Array<[number, number]> = [
    [0.5, 40.1], // IEC 60228, class 5 tinned, 0.5 mm²: 40.1 Ω/km
    [0.75, 26.7], // IEC 60228, class 5 tinned, 0.75 mm²: 26.7 Ω/km
    [1.0, 20.0], // IEC 60228, class 5 tinned, 1.0 mm²: 20.0 Ω/km
    [1.5, 13.7], // IEC 60228, class 5 tinned, 1.5 mm²: 13.7 Ω/km
    [2.5, 8.21], // IEC 60228, class 5 tinned, 2.5 mm²: 8.21 Ω/km
    [4, 5.09], // IEC 60228, class 5 tinned, 4 mm²: 5.09 Ω/km
    [6, 3.39], // IEC 60228, class 5 tinned, 6 mm²: 3.39 Ω/km
  ];

  it.each(class5)('class 5, %s mm² → %s Ω/km', (mm2, ohmPerKm) => {
    expect(resistanceOhmPerKm('iec60228-class5', { crossSectionMm2: mm2 })).toBe(ohmPerKm);
  });
  it.each(class12)('class 1/2, %s mm² → %s Ω/km', (mm2, ohmPerKm) => {
    expect(resistanceOhmPerKm('iec60228-class1-2', { crossSectionMm2: mm2 })).toBe(ohmPerKm);
  });
  it.each(class5Tinned)('class 5 tinned, %s mm² → %s Ω/km', (mm2, ohmPerKm) => {
    expect(resistanceOhmPerKm('iec60228-class5-tinned', { crossSectionMm2: mm2 })).toBe(ohmPerKm);
  });

  it('marks the sizes beyond the handbook table as recalled', () => {
    for (const table of [CONDUCTOR_TABLES['iec60228-class5'], CONDUCTOR_TABLES['iec60228-class1-2'], CONDUCTOR_TABLES['iec60228-class5-tinned']]) {
      for (const row of table.rows) {
        // Handbook (domain.md) lists 0.5–6 mm²; larger sizes are from memory and must say so.
        expect(row.resistanceSource.includes('from memory')).toBe(row.size > 6);
      }
    }
  });
});

describe('IEC 60028 temperature correction', () => {
  it('raises 1.5 mm² class 5 from 20 °C to 70 °C by α = 0.00393', () => {
    // IEC 60028: α20 = 0.00393 /K; 13.3 × (1 + 0.00393 × 50) = 15.91345 Ω/km (hand arithmetic)
    expect(resistanceOhmPerKm('iec60228-class5', { crossSectionMm2: 1.5 }, 70)).toBeCloseTo(15.91345, 5);
  });

  it('re-references α to 75 °C as NEC Table 8 does', () => {
    // NEC Chapter 9 Table 8 note: α = 0.00323 for copper at 75 °C (from memory)
    expect(copperAlphaAt(75)).toBeCloseTo(0.00323, 5);
    // IEC 60028: α at 20 °C is 0.00393
    expect(copperAlphaAt(20)).toBe(0.00393);
  });

  it('round-trips 20 °C → 75 °C → 20 °C', () => {
    // Linear copper model (IEC 60028): correcting up and back down must return the start value, 39.0 Ω/km (IEC 60228 class 5 0.5 mm²)
    const at75 = correctForTemperature(39.0, 20, 75);
    expect(correctForTemperature(at75, 75, 20)).toBeCloseTo(39.0, 9);
  });
});

describe('ASTM B258 AWG sizes', () => {
  it('gives 18 AWG the HyperPhysics area and resistance', () => {
    // HyperPhysics wire-gauge table: 18 AWG 0.823 mm²
    expect(awgAreaMm2(18)).toBeCloseTo(0.823, 3);
    // HyperPhysics wire-gauge table: 18 AWG solid copper 6.385 Ω/kft at 20 °C
    expect(toOhmPerKft(resistanceOhmPerKm('awg-solid', { awg: 18 }))).toBeCloseTo(6.385, 2);
  });

  it('matches the NEC Table 8 solid values once corrected to 75 °C', () => {
    // NEC Chapter 9 Table 8, solid uncoated copper at 75 °C, Ω/kft (domain.md); Table 8 gives three figures, so 0.5 %.
    const necSolid: Array<[number, number]> = [
      [18, 7.77], // NEC Ch. 9 Table 8, 18 AWG solid: 7.77 Ω/kft
      [16, 4.89], // NEC Ch. 9 Table 8, 16 AWG solid: 4.89 Ω/kft
      [14, 3.07], // NEC Ch. 9 Table 8, 14 AWG solid: 3.07 Ω/kft
      [12, 1.93], // NEC Ch. 9 Table 8, 12 AWG solid: 1.93 Ω/kft
    ];
    for (const [awg, ohmPerKft] of necSolid) {
      const ours = toOhmPerKft(resistanceOhmPerKm('awg-solid', { awg }, 75));
      expect(Math.abs(ours / ohmPerKft - 1)).toBeLessThan(0.005);
    }
  });

  it('gives 36 AWG the formula’s anchor diameter and 0 (1/0) its top', () => {
    // ASTM B258 defining points: 36 AWG is 0.0050 in = 0.127 mm (from memory)
    expect(awgDiameterMm(36)).toBeCloseTo(0.127, 12);
    // ASTM B258 defining points: 0000 (4/0) AWG is 0.4600 in = 11.684 mm, i.e. n = −3 (from memory)
    expect(awgDiameterMm(-3)).toBeCloseTo(11.684, 9);
  });
});

describe('NEC Chapter 9 Table 8 stranded copper at 75 °C', () => {
  const stranded: Array<[number, number]> = [
    [18, 7.95], // NEC Ch. 9 Table 8, 18 AWG stranded: 7.95 Ω/kft
    [16, 4.99], // NEC Ch. 9 Table 8, 16 AWG stranded: 4.99 Ω/kft
    [14, 3.14], // NEC Ch. 9 Table 8, 14 AWG stranded: 3.14 Ω/kft
    [12, 1.98], // NEC Ch. 9 Table 8, 12 AWG stranded: 1.98 Ω/kft
  ];
  it.each(stranded)('%s AWG → %s Ω/kft at its 75 °C default', (awg, ohmPerKft) => {
    expect(toOhmPerKft(resistanceOhmPerKm('nec-ch9-t8-stranded', { awg }))).toBeCloseTo(ohmPerKft, 10);
  });

  it('has 75 °C as its reference temperature', () => {
    // NEC Chapter 9 Table 8 heading: resistance at 75 °C
    expect(CONDUCTOR_TABLES['nec-ch9-t8-stranded'].referenceTemperatureC).toBe(75);
    // IEC 60228 and the ASTM-derived values are at 20 °C (domain.md)
    expect(CONDUCTOR_TABLES['awg-solid'].referenceTemperatureC).toBe(20);
  });
});

describe('unit conversions, cross-checked with mathjs', () => {
  it('converts the NEC Ω/kft figure to Ω/km as mathjs does', () => {
    // mathjs: 7.95 Ω per 1000 ft expressed in Ω/km (NEC Ch. 9 Table 8, 18 AWG stranded: 7.95 Ω/kft)
    const viaMathjs = (unit(7.95, 'ohm').divide(unit(1000, 'ft')) as Unit).toNumber('ohm/km');
    expect(resistanceOhmPerKm('nec-ch9-t8-stranded', { awg: 18 })).toBeCloseTo(viaMathjs, 10);
  });

  it('turns an AWG diameter into circular mils and back into mm² as mathjs does', () => {
    const dMil = unit(awgDiameterMm(18), 'mm').toNumber('mil'); // mathjs: mm → mil
    const circularMils = dMil * dMil; // 1 cmil = area of a 1-mil circle = π/4 mil² (definition)
    // ASTM B258 / common wire tables: 18 AWG = 1 624 cmil (from memory)
    expect(circularMils).toBeCloseTo(1624, -1);
    // mathjs: π/4 · cmil in mil² → mm²
    const areaViaMathjs = unit((Math.PI / 4) * circularMils, 'mil^2').toNumber('mm^2');
    expect(awgAreaMm2(18)).toBeCloseTo(areaViaMathjs, 10);
  });

  it('derives the ASTM solid resistance from ρ = 1/58 as mathjs does', () => {
    // mathjs: (1/58 Ω·mm²/m) / A → Ω/km; ρ = 1/58 from IEC 60028 (100 % IACS)
    const viaMathjs = (unit(1 / 58, 'ohm mm^2 / m').divide(unit(awgAreaMm2(14), 'mm^2')) as Unit).toNumber('ohm/km');
    expect(resistanceOhmPerKm('awg-solid', { awg: 14 })).toBeCloseTo(viaMathjs, 9);
  });
});
