import { cableRequestSchema } from '../../../../shared/schemas/cable.js';
import { driverRequestSchema } from '../../../../shared/schemas/driver.js';
import { pixelsRequestSchema } from '../../../../shared/schemas/pixels.js';
import { reelsRequestSchema } from '../../../../shared/schemas/reels.js';
import { voltageDropRequestSchema } from '../../../../shared/schemas/voltage-drop.js';
import { CONDUCTOR_TABLE_IDS } from '../../../../shared/tables/conductors.js';
import type { CableResponse, DriverResponse, PixelsResponse, ReelsResponse, VoltageDropResponse } from '../core/api-types.js';
import type { BenchCalculator, BenchFigure } from './bench-form-model.js';

function define<T>(calculator: Omit<BenchCalculator, 'figures'> & { figures(result: T): BenchFigure[] }): BenchCalculator {
  return calculator as BenchCalculator;
}

const n = (value: number | null | undefined, unit = '', digits = 3): string =>
  value === null || value === undefined ? '—' : `${Number(value.toFixed(digits))}${unit ? ` ${unit}` : ''}`;
const yesNo = (value: boolean) => (value ? 'yes' : 'no');

const TABLES = CONDUCTOR_TABLE_IDS.map((id) => ({ value: id, label: id }));
const LOADS = [
  { value: 'end', label: 'all at the far end' },
  { value: 'uniform', label: 'spread along the run' },
];

// The pre-filled values are the documented examples of the API (a 14-tread flight of 24 V strip, demo-scenario.md).
export const BENCH_CALCULATORS: readonly BenchCalculator[] = [
  define<VoltageDropResponse>({
    id: 'voltage-drop',
    title: 'Voltage drop',
    summary: 'Drop along a two-wire DC run, and whether it stays within the limit.',
    path: '/v1/calculations/voltage-drop',
    schema: voltageDropRequestSchema,
    fields: [
      { name: 'supplyVoltageV', label: 'Supply', unit: 'V', kind: 'number', initial: '24' },
      { name: 'currentA', label: 'Current', unit: 'A', kind: 'number', initial: '0.354' },
      { name: 'lengthM', label: 'Run length, one way', unit: 'm', kind: 'number', initial: '2.68' },
      { name: 'conductor.crossSectionMm2', label: 'Cross-section', unit: 'mm²', kind: 'number', initial: '0.5', hint: 'Or leave empty and give an AWG.' },
      { name: 'conductor.awg', label: 'or AWG', kind: 'number' },
      { name: 'conductorTable', label: 'Conductor table', kind: 'select', options: TABLES, hint: 'Empty: the usual table for mm² or AWG.' },
      { name: 'temperatureC', label: 'Conductor temperature', unit: '°C', kind: 'number' },
      { name: 'loadDistribution', label: 'Load', kind: 'select', options: LOADS },
      { name: 'maxDropPercent', label: 'Drop limit', unit: '%', kind: 'number', hint: 'Empty: 5 %.' },
    ],
    figures: (r) => [
      { label: 'Drop', value: `${n(r.dropV, 'V')} (${n(r.dropPercent, '%', 2)})` },
      { label: 'Voltage at the load', value: n(r.voltageAtLoadV, 'V') },
      { label: 'Within the limit', value: `${yesNo(r.withinLimit)} (limit ${n(r.maxDropPercent, '%')})` },
      { label: 'Loop resistance', value: n(r.loopResistanceOhm, 'Ω', 4) },
      { label: 'Current rating', value: n(r.currentRatingA, 'A') },
    ],
  }),
  define<CableResponse>({
    id: 'cable',
    title: 'Cable size',
    summary: 'The smallest standard conductor that keeps the drop within the limit and carries the current.',
    path: '/v1/calculations/cable',
    schema: cableRequestSchema,
    fields: [
      { name: 'supplyVoltageV', label: 'Supply', unit: 'V', kind: 'number', initial: '24' },
      { name: 'currentA', label: 'Current', unit: 'A', kind: 'number', initial: '0.354' },
      { name: 'lengthM', label: 'Run length, one way', unit: 'm', kind: 'number', initial: '2.68' },
      { name: 'maxDropPercent', label: 'Drop limit', unit: '%', kind: 'number', initial: '5' },
      { name: 'conductorTable', label: 'Conductor table', kind: 'select', options: TABLES },
      { name: 'minCrossSectionMm2', label: 'Thinnest allowed', unit: 'mm²', kind: 'number', hint: 'Empty: 0.5 mm².' },
      { name: 'temperatureC', label: 'Conductor temperature', unit: '°C', kind: 'number' },
      { name: 'loadDistribution', label: 'Load', kind: 'select', options: LOADS },
    ],
    figures: (r) => [
      {
        label: 'Recommended',
        value: r.recommended ? ('awg' in r.recommended ? `AWG ${r.recommended.awg}` : `${r.recommended.crossSectionMm2} mm²`) : 'no size of the table passes',
      },
      { label: 'Drop with it', value: r.dropV === null ? '—' : `${n(r.dropV, 'V')} (${n(r.dropPercent, '%', 2)})` },
      { label: 'Current rating', value: n(r.currentRatingA, 'A') },
      { label: 'Table', value: r.conductorTable },
    ],
  }),
  define<DriverResponse>({
    id: 'driver',
    title: 'Drivers',
    summary: 'LED drivers for a load: how many circuits, which rating, how loaded.',
    path: '/v1/calculations/driver',
    schema: driverRequestSchema,
    fields: [
      { name: 'loadW', label: 'Load', unit: 'W', kind: 'number', initial: '119' },
      { name: 'outputVoltageV', label: 'Output voltage', unit: 'V', kind: 'number', initial: '24' },
      { name: 'availableRatingsW', label: 'Ratings to choose from', unit: 'W', kind: 'numbers', initial: '60, 100, 150, 240', hint: 'Separated by commas. Empty: a standard range.' },
      { name: 'maxLoadingPercent', label: 'Load each driver to at most', unit: '%', kind: 'number', hint: 'Empty: 80 %.' },
      { name: 'maxSupplyVA', label: 'Largest supply', unit: 'VA', kind: 'number' },
      { name: 'class2', label: 'Class 2 supplies', kind: 'toggle' },
      { name: 'efficiencyPercent', label: 'Efficiency', unit: '%', kind: 'number', hint: 'Given: the mains side is worked out too.' },
    ],
    figures: (r) => [
      { label: 'Drivers', value: r.drivers.map((d) => `${d.count} × ${d.ratingW} W`).join(', ') || 'no usable rating' },
      { label: 'Circuits', value: String(r.circuits) },
      { label: 'Loading', value: n(r.loadingPercent, '%', 1) },
      { label: 'Required rating', value: n(r.requiredRatingW, 'W', 2) },
      ...(r.inputPowerW !== undefined ? [{ label: 'Mains input', value: `${n(r.inputPowerW, 'W', 1)}, ${n(r.mainsCurrentA, 'A')}` }] : []),
    ],
  }),
  define<PixelsResponse>({
    id: 'pixels',
    title: 'Pixel data',
    summary: 'Frame time, refresh rate, data outputs and full-white power of an addressable run.',
    path: '/v1/calculations/pixels',
    schema: pixelsRequestSchema,
    fields: [
      { name: 'pixels', label: 'Pixels', kind: 'number', initial: '1080' },
      {
        name: 'protocol',
        label: 'Protocol',
        kind: 'select',
        initial: 'one-wire-800k',
        options: [
          { value: 'one-wire-800k', label: 'one-wire, 800 kbit/s' },
          { value: 'one-wire-400k', label: 'one-wire, 400 kbit/s' },
          { value: 'clocked', label: 'data + clock' },
        ],
      },
      {
        name: 'bitsPerPixel',
        label: 'Bits per pixel',
        kind: 'select',
        numericOptions: true,
        options: [
          { value: '24', label: '24 (RGB)' },
          { value: '32', label: '32 (RGBW)' },
        ],
      },
      { name: 'maxPixelsPerOutput', label: 'Most pixels per output', kind: 'number', initial: '800' },
      { name: 'supplyVoltageV', label: 'Strip supply', unit: 'V', kind: 'number', initial: '5' },
      { name: 'brightnessPercent', label: 'Brightness cap', unit: '%', kind: 'number', initial: '50' },
      { name: 'currentPerPixelMa', label: 'Current per pixel at full white', unit: 'mA', kind: 'number' },
      { name: 'clockHz', label: 'Clock (data + clock only)', unit: 'Hz', kind: 'number' },
    ],
    figures: (r) => [
      { label: 'Frame time', value: n(r.frameTimeUs, 'µs', 1) },
      { label: 'Highest refresh', value: n(r.maxRefreshHz, 'Hz', 1) },
      { label: 'Data outputs', value: `${r.outputsNeeded} (${r.pixelsPerOutput} pixels on the busiest)` },
      { label: 'Full white', value: `${n(r.fullWhiteCurrentA, 'A', 2)}, ${n(r.powerW, 'W', 1)}` },
    ],
  }),
  define<ReelsResponse>({
    id: 'reels',
    title: 'Reels',
    summary: 'How many reels the tread pieces need, cut without a joint inside any piece.',
    path: '/v1/calculations/reels',
    schema: reelsRequestSchema,
    fields: [
      { name: 'piecesMm', label: 'Pieces', unit: 'mm', kind: 'numbers', initial: '850, 850, 850, 850, 850, 850, 850', hint: 'Tread 1 first, separated by commas.' },
      { name: 'reelLengthMm', label: 'Reel length', unit: 'mm', kind: 'number', initial: '5000' },
      { name: 'cutPitchMm', label: 'Cut pitch', unit: 'mm', kind: 'number', initial: '50' },
    ],
    figures: (r) => [
      { label: 'Reels', value: `${r.reels}${r.provenOptimal ? ' (no plan needs fewer)' : ` (at least ${r.lowerBoundReels})`}` },
      { label: 'Left over', value: n(r.totalWasteMm, 'mm', 0) },
      ...r.plan.map((reel) => ({ label: `Reel ${reel.reel}`, value: `${reel.piecesMm.join(' + ')} mm, ${reel.wasteMm} mm left` })),
    ],
  }),
];
