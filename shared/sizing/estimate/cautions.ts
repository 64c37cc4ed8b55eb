import type { Caution } from '../../schemas/estimate.js';

const freeze = (code: string, message: string): Caution => Object.freeze({ code, message });

/** Carried by every estimate, whatever its figures. */
const ALWAYS: readonly Caution[] = [
  freeze(
    'mains-work',
    'Treadwise sizes the low-voltage side only. Connecting drivers to the mains is work for a licensed electrician, and the local wiring rules (NEC, IEC 60364 or the national rules) and the installer’s judgement take precedence over these figures.',
  ),
  freeze(
    'first-power-on',
    'Before the first power-on, check every run for short circuits and every strip and sensor lead for polarity; a reversed sensor lead is a common fault.',
  ),
  freeze(
    'driver-heat',
    'Give drivers room to breathe: mount them where air moves and derate them as their datasheets ask when the space runs warm.',
  ),
  freeze(
    'one-supply-per-circuit',
    'Each driver feeds only its own circuit: never connect driver outputs in parallel (unless the datasheet allows it), never join the + of two circuits, and fit each feeder’s fuse at its driver as the circuits list gives it.',
  ),
  freeze(
    'not-emergency-lighting',
    'Motion-switched stair lights are orientation lighting, not emergency or escape-route lighting (EN 1838 and the building’s emergency lighting design cover that).',
  ),
  freeze(
    'nominal-data',
    'Every figure is an estimate from nominal data; confirm currents, cut pitches, feed lengths and cable ratings with the datasheets of the parts actually bought.',
  ),
];

const HIGH_CURRENT = freeze(
  'high-current',
  'A rail carries more than 10 A: fuse each feeder and pixel feed branch at or below its cable’s rating.',
);
const ABOVE_60V = freeze(
  'above-60v',
  'A rail is above 60 V DC: no live part may be left exposed; enclose the strip, its joints and terminals.',
);

/** The estimate’s cautions; conditional ones only when the design calls for them. */
export function cautionsFor(maxRailCurrentA: number, maxRailVoltageV: number): Caution[] {
  const cautions = ALWAYS.slice();
  if (maxRailCurrentA > 10) cautions.push(HIGH_CURRENT);
  if (maxRailVoltageV > 60) cautions.push(ABOVE_60V);
  return cautions;
}
