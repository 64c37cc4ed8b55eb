import type { EstimateCheck } from '../../schemas/estimate.js';
import { flagged, fmt, passed, treadsText, type Design } from './checks.js';

const PROFILE = 'controller profile';

/** One CV output per tread; several controllers when one has too few. */
export function outputCountCheck(d: Design): EstimateCheck | null {
  const part = d.treadStrips;
  if (!part) return null;
  const { profile } = d.settings;
  const needed = part.allocation.outputsNeeded;
  if (profile.outputs === 0) {
    return flagged(
      'output-count',
      'fail',
      `The controller has no constant-voltage outputs; the ${needed} tread strips need ${needed}.`,
      needed,
      0,
      'outputs',
      PROFILE,
      `Choose a controller with at least ${needed} CV outputs, one per tread.`,
    );
  }
  // Lit landings take an output each, in the sequence between their flights.
  const lit = part.landingRows.length;
  const what = lit > 0 ? `${needed - lit} treads and ${lit} lit landing${lit === 1 ? '' : 's'}` : `${needed} treads`;
  if (part.allocation.outputCountOk) {
    return passed('output-count', `${what} use ${needed} of the controller's ${profile.outputs} outputs.`, needed, profile.outputs, 'outputs', PROFILE);
  }
  const blocks = part.allocation.controllers;
  return flagged(
    'output-count',
    'warn',
    `${what} need ${needed} outputs; one controller has ${profile.outputs}, so ${blocks.length} controllers share the treads (${treadsText(blocks)}).`,
    needed,
    profile.outputs,
    'outputs',
    PROFILE,
    `Fit ${blocks.length} controllers as planned (treads ${treadsText(blocks)}), or choose a controller with at least ${needed} outputs.`,
  );
}

export function outputCurrentCheck(d: Design): EstimateCheck | null {
  const part = d.treadStrips;
  if (!part || part.allocation.outputs.length === 0) return null;
  const { profile } = d.settings;
  const limit = profile.maxCurrentPerOutputA;
  const currentA = part.allocation.maxOutputCurrentA;
  const value = Math.round(currentA * 1e4) / 1e4;
  if (part.allocation.outputCurrentOk) {
    return passed('output-current', `The busiest output carries ${fmt(currentA, 3)} A of the ${limit} A allowed.`, value, limit, 'A', PROFILE);
  }
  // The tread that draws most (treads may differ in width).
  const { strip, largestFit: fit } = part;
  const lengthM = fit.stripLengthMm / 1000;
  // Strip power at which one tread's piece stays within the output limit.
  const maxWPerM = Math.floor(((limit * strip.voltageV) / lengthM) * 10) / 10;
  const at24 = strip.voltageV < 24 ? (strip.powerWPerM * lengthM) / 24 : null;
  const higherVoltage = at24 !== null && at24 <= limit ? `; a 24 V strip of the same power draws ${fmt(at24, 3)} A` : '';
  return flagged(
    'output-current',
    'fail',
    `Each tread's ${fit.stripLengthMm} mm of ${strip.powerWPerM} W/m strip draws ${fmt(currentA, 3)} A, over the ${limit} A one output may carry.`,
    value,
    limit,
    'A',
    PROFILE,
    `Use a lower-power strip: at most ${maxWPerM} W/m at ${strip.voltageV} V keeps a ${fit.stripLengthMm} mm piece within ${limit} A${higherVoltage}; or choose a controller rated for at least ${Math.ceil(currentA * 10) / 10} A per output.`,
  );
}

/** All CV current passes through the controller; pixel power is fed at the strip instead. */
export function controllerInputCheck(d: Design): EstimateCheck | null {
  const part = d.treadStrips;
  if (!part || part.allocation.controllers.length === 0) return null;
  const { profile } = d.settings;
  const blocks = part.allocation.controllers;
  let worst = blocks[0] as (typeof blocks)[number];
  for (const b of blocks) if (b.currentA > worst.currentA) worst = b;
  const value = Math.round(worst.currentA * 1e4) / 1e4;
  const max = profile.maxInputCurrentA;
  if (max === undefined) {
    return flagged(
      'controller-input-current',
      'warn',
      `The profile gives no maximum input current; ${fmt(worst.currentA, 3)} A of strip current passes through controller ${worst.controller}.`,
      value,
      null,
      'A',
      PROFILE,
      `Confirm on the controller's datasheet that its input accepts ${fmt(worst.currentA, 2)} A, and add maxInputCurrentA to the profile.`,
    );
  }
  if (worst.currentA <= max) {
    const split = blocks.length > Math.ceil(part.rows.length / Math.min(profile.outputs, profile.maxTreads ?? Infinity));
    return passed(
      'controller-input-current',
      `The busiest controller passes ${fmt(worst.currentA, 3)} A of its ${max} A input${split ? `, after splitting the treads over ${blocks.length} controllers` : ''}.`,
      value,
      max,
      'A',
      PROFILE,
    );
  }
  const moreControllers = Math.ceil((worst.currentA * blocks.length) / max);
  return flagged(
    'controller-input-current',
    'fail',
    `Controller ${worst.controller} (treads ${treadsText([worst])}) would pass ${fmt(worst.currentA, 3)} A, over its ${max} A input.`,
    value,
    max,
    'A',
    PROFILE,
    part.load.currentA > max
      ? `A single tread draws ${fmt(part.load.currentA, 3)} A, more than the whole input allows: use a lower-power strip or a controller rated for at least ${Math.ceil(part.load.currentA)} A input.`
      : `Spread the treads over ${moreControllers} controllers, or choose a controller rated for at least ${Math.ceil(worst.currentA)} A input.`,
  );
}
