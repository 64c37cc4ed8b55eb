import type { CheckId, EstimateCheck } from '../../schemas/estimate.js';
import type { StairGeometry } from '../geometry.js';
import type { CableUse } from './cable-schedule.js';
import type { RailPart } from './rail-pixels.js';
import type { SensorPart } from './sensor-layout.js';
import type { Settings } from './settings.js';
import type { TreadBlock } from './stair.js';
import type { TreadReels } from './strip-reels.js';
import type { Supplies } from './supply.js';
import type { TreadPixelPart } from './tread-pixels.js';
import type { TreadStripPart } from './tread-strips.js';

export const PRACTICE = 'common practice, no published source';

type Value = EstimateCheck['value'];
type Limit = EstimateCheck['limit'];

export function passed(id: CheckId, message: string, value: Value, limit: Limit, unit: string, reference: string): EstimateCheck {
  return { id, status: 'pass', message, value, limit, unit, reference };
}

/** A warn or a fail always says what to change. */
export function flagged(
  id: CheckId,
  status: 'warn' | 'fail',
  message: string,
  value: Value,
  limit: Limit,
  unit: string,
  reference: string,
  suggestion: string,
): EstimateCheck {
  return { id, status, message, value, limit, unit, reference, suggestion };
}

/** Everything the checks look at, computed once by the estimate. */
export interface Design {
  settings: Settings;
  stair: StairGeometry | null;
  treadStrips: TreadStripPart | null;
  treadPixels: TreadPixelPart | null;
  rail: RailPart | null;
  controllers: number;
  controllerBlocks: TreadBlock[];
  supplies: Supplies;
  sensors: SensorPart;
  treadReels: TreadReels | null;
  cableUses: CableUse[];
}

export function treadsText(blocks: readonly TreadBlock[]): string {
  return blocks.map((b) => (b.firstTread === b.lastTread ? `${b.firstTread}` : `${b.firstTread}–${b.lastTread}`)).join(', ');
}

/** Rounds a number for a message. */
export function fmt(value: number, decimals = 2): string {
  const f = 10 ** decimals;
  return String(Math.round(value * f) / f);
}
