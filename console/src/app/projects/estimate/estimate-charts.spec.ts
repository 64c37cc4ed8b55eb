import { describe, expect, it } from 'vitest';

import { alderRowTownhouseResponse } from '../../../../../shared/schemas/estimate-examples.js';
import type { EstimateResponse } from '../../core/api-types.js';
import { outputLoadChart, treadDropChart } from './estimate-charts.js';

const ALDER = alderRowTownhouseResponse as unknown as EstimateResponse;

describe('treadDropChart', () => {
  it('draws each tread’s end-to-end drop against the cable-drop check’s limit', () => {
    const chart = treadDropChart(ALDER);
    expect(chart.limit).toBe(5); // the example's cable-drop check: 5 % end to end
    expect(chart.unit).toBe('%');
    expect(chart.bars.map((b) => [b.label, b.value])).toEqual(ALDER.treads.map((t) => [String(t.index), t.pathDropPercent]));
    expect(chart.bars.every((b) => b.status === 'within')).toBe(true);
    expect(chart.max).toBeCloseTo(5.5); // the limit with headroom, since every bar is below it
  });

  it('marks a tread over the limit and one near it, and scales to the tallest bar', () => {
    const treads = [
      { ...ALDER.treads[0]!, index: 1, pathDropPercent: 6.2 },
      { ...ALDER.treads[0]!, index: 2, pathDropPercent: 4.6 },
      { ...ALDER.treads[0]!, index: 3, pathDropPercent: undefined, dropPercent: 1.2 },
    ];
    const chart = treadDropChart({ ...ALDER, treads });
    expect(chart.bars.map((b) => b.status)).toEqual(['over', 'near', 'within']);
    expect(chart.bars[2]!.value).toBe(1.2); // the lead's own drop when no end-to-end figure is given
    expect(chart.max).toBeCloseTo(6.82);
  });
});

describe('outputLoadChart', () => {
  it('draws each output’s current against the controller’s per-output limit', () => {
    const chart = outputLoadChart(ALDER)!;
    expect(chart.limit).toBe(1.5); // HL-K20: 1.5 A per output
    expect(chart.bars.map((b) => b.label)).toEqual(ALDER.outputs.cv.map((o) => String(o.output)));
    expect(chart.bars[0]!.value).toBe(0.3542);
  });

  it('names outputs by controller when there are several, and draws nothing without CV outputs', () => {
    const two = { ...ALDER, outputs: { ...ALDER.outputs, controllers: 2, cv: [{ ...ALDER.outputs.cv[0]!, controller: 2, output: 3 }] } };
    expect(outputLoadChart(two)!.bars[0]!.label).toBe('2.3');
    expect(outputLoadChart({ ...ALDER, outputs: { ...ALDER.outputs, cv: [] } })).toBeNull();
  });
});
