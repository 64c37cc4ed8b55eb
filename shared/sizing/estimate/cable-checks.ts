import type { EstimateCheck } from '../../schemas/estimate.js';
import { DEFAULT_MIN_CROSS_SECTION_MM2 } from '../cable.js';
import { conductorTable, describeSize, sizeOfRow } from '../conductors.js';
import { PRACTICE_MAX_RUN_M } from '../geometry.js';
import { DROP_LIMIT_REFERENCE, LOOP_REFERENCE } from '../voltage-drop.js';
import { describeUse, type CableUse } from './cable-schedule.js';
import type { Feeder } from './circuits.js';
import { PROTECTION_REFERENCE } from '../protection.js';
import { flagged, fmt, passed, treadsText, type Design } from './checks.js';
import { minimumFor, nextSizeLabel, sizeLabel } from './run-cable.js';
import { ELV_MIN_CROSS_SECTION_MM2, ELV_MINIMUM_REFERENCE } from './settings.js';
import { runLengthAdvice } from './stair.js';

const RUN_LENGTH_REFERENCE = 'common practice, no published source: controller-to-tread runs of 10 m or less';
const MIN_SIZE_REFERENCE = 'common practice, no published source: copper no thinner than 0.5 mm²';

function worstBy(uses: readonly CableUse[], score: (u: CableUse) => number): CableUse | null {
  let worst: CableUse | null = null;
  let worstScore = -Infinity;
  for (const u of uses) {
    const s = score(u);
    if (s > worstScore) {
      worst = u;
      worstScore = s;
    }
  }
  return worst;
}

/** Where moving or adding controllers brings the stair's runs (to at most limitM), in words. */
function controllerAdvice(d: Design, limitM: number): string | null {
  if (!d.stair || d.controllerBlocks.length === 0) return null;
  const advice = runLengthAdvice(d.stair, d.controllerBlocks, d.settings.cable.serviceAllowanceGiven, limitM);
  const current = worstBy(
    d.cableUses.filter((u) => u.use === 'tread leads' || u.use === 'chain leads'),
    (u) => u.run.lengthM,
  );
  const currentM = current ? current.run.lengthM : 0;
  const parts: string[] = [];
  if (advice.bestLongestRunM < currentM - 1e-6) {
    parts.push(
      `move the controller${advice.bestTreads.length > 1 ? 's' : ''} to tread${advice.bestTreads.length > 1 ? 's' : ''} ${advice.bestTreads.join(', ')}: the longest run falls to ${fmt(advice.bestLongestRunM)} m`,
    );
  }
  if (advice.controllersForLimit !== null && advice.controllersForLimit > d.controllerBlocks.length && advice.blocksForLimit) {
    parts.push(
      `fit ${advice.controllersForLimit} controllers, one mid-way along each of treads ${treadsText(advice.blocksForLimit)}: the longest run becomes ${fmt(advice.longestWithThoseM as number)} m`,
    );
  }
  return parts.length > 0 ? capitalise(parts.join('; or ')) + '.' : null;
}

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** Where each circuit's driver would make its longest feeder shortest: midway between its farthest feeds. */
function spreadPositionsM(d: Design): number[] {
  return d.supplies.circuits.map((c) => {
    let lo = Infinity;
    let hi = -Infinity;
    for (const t of c.targets) {
      lo = Math.min(lo, t.positionM);
      hi = Math.max(hi, t.positionM);
    }
    return Math.round(((lo + hi) / 2) * 100) / 100;
  });
}

function feederText(f: Feeder): string {
  return f.target.to === 'controller' ? `controller ${f.target.controller}` : `pixel feed point ${f.target.feedPoint}`;
}

/**
 * The drop limit applies end to end: driver → feeder → lead (or chain links) → strip. Every
 * path is checked by its value, whatever else its cables fail, so a run that also fails on
 * current is never reported as within the limit.
 */
export function cableDropCheck(d: Design): EstimateCheck {
  const { cable } = d.settings;
  const limit = cable.maxDropPercent;
  const reference = `${LOOP_REFERENCE}; series drop driver → feeder → lead → strip; limit: ${DROP_LIMIT_REFERENCE}`;
  let worst: Feeder | null = null;
  for (const f of d.supplies.feeders) if (f.target.currentA > 0 && (!worst || f.pathDropPercent > worst.pathDropPercent)) worst = f;
  // Powered runs outside any feeder's path (none today) still count on their own.
  const loose = worstBy(
    d.cableUses.filter((u) => u.powered && u.use !== 'feeders'),
    (u) => u.run.dropPercent,
  );
  if (!worst && !loose) return passed('cable-drop', 'No cable carries power.', 0, limit, '%', reference);
  const pathValue = worst ? worst.pathDropPercent : 0;
  const value = Math.round(Math.max(pathValue, loose ? loose.run.dropPercent : 0) * 1000) / 1000;
  if (!worst || (loose && loose.run.dropPercent > pathValue)) {
    const u = loose as CableUse;
    const ok = u.run.dropPercent <= limit * (1 + 1e-9);
    const text = `Worst drop ${fmt(u.run.dropPercent, 3)} % on ${describeUse(u)} (${sizeLabel(u.run)})`;
    return ok
      ? passed('cable-drop', `${text}, within ${limit} %.`, value, limit, '%', reference)
      : flagged('cable-drop', 'fail', `${text}, over ${limit} %${beyondSupply(value)}.`, value, limit, '%', reference, 'Feed the far treads from a second controller nearer to them, or use a higher-voltage strip.');
  }
  const behind = worst.pathDropPercent - worst.run.dropPercent;
  const parts = `feeder ${fmt(worst.run.dropPercent, 3)} % (${sizeLabel(worst.run)}, ${fmt(worst.run.lengthM)} m)${worst.worstBehind ? ` + ${fmt(behind, 3)} % on ${worst.worstBehind}` : ''}`;
  const split = cable.feederDropPercent !== undefined ? ` (feeders given ${cable.feederDropPercent} % of it)` : '';
  if (worst.pathDropPercent <= limit * (1 + 1e-9)) {
    return passed(
      'cable-drop',
      `Worst drop from a driver to a strip ${fmt(worst.pathDropPercent, 3)} % (circuit ${worst.circuit}, to ${feederText(worst)}: ${parts}), within the ${limit} % end-to-end limit${split}.`,
      value,
      limit,
      '%',
      reference,
    );
  }
  let suggestion: string;
  if (worst.run.dropPercent >= behind) {
    const spread = spreadPositionsM(d);
    const moved = d.supplies.circuits.some((c, i) => Math.abs(c.driverPositionM - (spread[i] as number)) > 0.05);
    if (worst.alongM > 0.05 && moved) {
      suggestion = `The drivers must be spread along the run: put each circuit's driver midway along what it feeds (drivers.positionsM: [${spread.join(', ')}]), or split the load into more circuits, or use a higher-voltage supply.`;
    } else if (worst.alongM > 0.05) {
      suggestion = `Split the load into more circuits with their drivers spread along the run (drivers.positionsM), so each feeder is shorter, or use a higher-voltage supply.`;
    } else {
      const maxLengthM = (worst.run.lengthM * Math.max(0, limit - behind)) / worst.run.dropPercent;
      suggestion = `Shorten the feeder to ${fmt(Math.floor(maxLengthM * 10) / 10, 1)} m or less (mount the driver beside the ${worst.target.to === 'controller' ? 'controller' : 'feed point'}), or split the load over more feeders, or use a higher-voltage supply.`;
    }
  } else {
    const leadUse = worstBy(
      d.cableUses.filter((u) => u.use === 'tread leads' || u.use === 'chain links'),
      (u) => u.run.dropPercent,
    );
    const passingLengthM = leadUse && leadUse.run.dropPercent > 0 ? (leadUse.run.lengthM * Math.max(0, limit - worst.run.dropPercent)) / leadUse.run.dropPercent : PRACTICE_MAX_RUN_M;
    suggestion =
      controllerAdvice(d, passingLengthM) ??
      `Feed the far treads from a second controller nearer to them, or use a higher-voltage strip (the same power at twice the voltage drops a quarter as much).`;
  }
  return flagged(
    'cable-drop',
    'fail',
    `The drop from the driver of circuit ${worst.circuit} to the farthest strip behind ${feederText(worst)} is ${fmt(worst.pathDropPercent, 3)} % (${parts}), over the ${limit} % end-to-end limit${split}${beyondSupply(value)}; no size of ${cable.conductorTable} up to ${describeLargest(d)} brings it within.`,
    value,
    limit,
    '%',
    reference,
    suggestion,
  );
}

function describeLargest(d: Design): string {
  const table = conductorTable(d.settings.cable.conductorTable);
  return describeSize(sizeOfRow(table, table.rows[table.rows.length - 1]!));
}

export function cableCurrentCheck(d: Design): EstimateCheck {
  const powered = d.cableUses.filter((u) => u.powered && u.run.currentA > 0);
  const worst = worstBy(powered, (u) => u.run.currentA / u.run.currentRatingA);
  const table = conductorTable(d.settings.cable.conductorTable);
  if (!worst) return passed('cable-current', 'No cable carries power.', 0, null, 'A', table.rows[0]!.currentRatingSource);
  // Any run no size can carry fails, even one whose load current alone would fit (a feeder must carry its driver's limit).
  const failing = worstBy(
    powered.filter((u) => u.run.failure === 'current'),
    (u) => u.run.currentA / u.run.currentRatingA,
  );
  if (failing && failing.run.currentA <= failing.run.currentRatingA) {
    const circuit = d.supplies.circuits.find((c) => c.index === failing.circuit);
    const limitA = circuit?.response.driver?.currentLimitA ?? null;
    return flagged(
      'cable-current',
      'fail',
      `${capitalise(describeUse(failing))} carries ${fmt(failing.run.currentA, 3)} A, but no size of the table carries its driver's ${limitA === null ? '' : `${fmt(limitA, 2)} A `}current limit, and no fuse that driver could open protects a thinner one.`,
      Math.round(failing.run.currentA * 1e4) / 1e4,
      failing.run.currentRatingA,
      'A',
      `${table.rows[table.rows.length - 1]!.currentRatingSource}; ${PROTECTION_REFERENCE}`,
      'Split the circuit so each driver is smaller (more circuits, each on its own driver), or use a higher-voltage supply.',
    );
  }
  const ratingSource = table.rows.find((r) => r.currentRatingA === worst.run.currentRatingA)?.currentRatingSource ?? table.reference;
  const value = Math.round(worst.run.currentA * 1e4) / 1e4;
  if (worst.run.failure !== 'current') {
    return passed(
      'cable-current',
      `Every cable carries its current; the most loaded is ${describeUse(worst)}: ${fmt(worst.run.currentA, 3)} A on ${sizeLabel(worst.run)} rated ${worst.run.currentRatingA} A.`,
      value,
      worst.run.currentRatingA,
      'A',
      ratingSource,
    );
  }
  const split = Math.ceil(worst.run.currentA / worst.run.currentRatingA);
  return flagged(
    'cable-current',
    'fail',
    `${capitalise(describeUse(worst))} carries ${fmt(worst.run.currentA, 3)} A, more than even ${describeLargest(d)} is rated for (${worst.run.currentRatingA} A).`,
    value,
    worst.run.currentRatingA,
    'A',
    ratingSource,
    worst.use === 'feeders'
      ? `Split the load over ${split} feeders of at most ${worst.run.currentRatingA} A each (e.g. one per block of treads or per pixel feed point), or use a higher-voltage supply.`
      : `Use a lower-power or higher-voltage strip so one run carries at most ${worst.run.currentRatingA} A.`,
  );
}

/** Runs from a controller to a tread: what summary.longestRunM and the 10 m practice limit are about. */
export function isControllerLead(u: CableUse): boolean {
  return u.use === 'tread leads' || u.use === 'chain leads';
}

export function cableRunLengthCheck(d: Design): EstimateCheck {
  const runs = d.cableUses.filter(isControllerLead);
  const worst = worstBy(runs, (u) => u.run.lengthM);
  if (!worst) return passed('cable-run-length', 'No lead runs from a controller to a tread (feeders are checked by cable-drop).', 0, PRACTICE_MAX_RUN_M, 'm', RUN_LENGTH_REFERENCE);
  const value = Math.round(worst.run.lengthM * 1000) / 1000;
  if (worst.run.lengthM <= PRACTICE_MAX_RUN_M) {
    return passed(
      'cable-run-length',
      `Longest lead from a controller ${fmt(worst.run.lengthM, 3)} m (${describeUse(worst)}), within ${PRACTICE_MAX_RUN_M} m.`,
      value,
      PRACTICE_MAX_RUN_M,
      'm',
      RUN_LENGTH_REFERENCE,
    );
  }
  return flagged(
    'cable-run-length',
    'warn',
    `${capitalise(describeUse(worst))} is ${fmt(worst.run.lengthM, 2)} m, over the ${PRACTICE_MAX_RUN_M} m practice limit.`,
    value,
    PRACTICE_MAX_RUN_M,
    'm',
    RUN_LENGTH_REFERENCE,
    controllerAdvice(d, PRACTICE_MAX_RUN_M) ?? `Feed the far treads from a second controller nearer to them.`,
  );
}

export function cableMinSizeCheck(d: Design): EstimateCheck | null {
  const c = d.settings.cable;
  if (d.cableUses.length === 0) return null;
  const elv = c.jurisdiction === 'iec' || c.jurisdiction === 'uk';
  const reference = elv ? ELV_MINIMUM_REFERENCE : MIN_SIZE_REFERENCE;
  // The trade's 0.5 mm², or the jurisdiction's ELV minimum (1 mm² for short flexible runs).
  const floorFor = (u: CableUse) => (elv ? minimumFor({ ...c, minCrossSectionMm2: ELV_MIN_CROSS_SECTION_MM2 }, u.run.lengthM) : DEFAULT_MIN_CROSS_SECTION_MM2);
  const sized = d.cableUses.filter((u) => u.run.size !== null);
  if (sized.length === 0) {
    // Nothing was chosen: there is no size to pass, so the check cannot pass either.
    return flagged(
      'cable-min-size',
      'fail',
      'No cable size could be chosen for any run (see cable-drop and cable-current), so the minimum size cannot be confirmed.',
      null,
      elv ? ELV_MIN_CROSS_SECTION_MM2 : DEFAULT_MIN_CROSS_SECTION_MM2,
      'mm²',
      reference,
      'Fix the failing drop or current checks first (shorter runs, more circuits, a higher voltage); then every run gets a size to check.',
    );
  }
  let thinnest: CableUse | null = null;
  let under: CableUse | null = null;
  for (const u of sized) {
    if (!thinnest || u.run.areaMm2 < thinnest.run.areaMm2) thinnest = u;
    if (u.run.areaMm2 < floorFor(u) * (1 - 1e-9) && (!under || u.run.areaMm2 < under.run.areaMm2)) under = u;
  }
  const worst = (under ?? thinnest) as CableUse;
  const limit = floorFor(worst);
  const area = worst.run.areaMm2;
  const value = Math.round(area * 1000) / 1000;
  const unsized = d.cableUses.length - sized.length;
  const unsizedText = unsized > 0 ? ` ${unsized} run${unsized > 1 ? 's have' : ' has'} no size yet (see the failing checks).` : '';
  if (!under) {
    return passed(
      'cable-min-size',
      `The thinnest cable chosen is ${sizeLabel(worst.run)}${c.system === 'awg' ? ` (${fmt(area, 3)} mm²)` : ''}, not below ${limit} mm²${elv ? ` (${c.jurisdiction?.toUpperCase()} ELV lighting minimum)` : ''}.${unsizedText}`,
      value,
      limit,
      'mm²',
      reference,
    );
  }
  const table = conductorTable(c.conductorTable);
  const firstOk = table.rows.find((r) => r.areaMm2 >= limit * (1 - 1e-9));
  const next = firstOk ? describeSize(sizeOfRow(table, firstOk)) : nextSizeLabel(c, area);
  return flagged(
    'cable-min-size',
    'warn',
    `${capitalise(describeUse(worst))} uses ${sizeLabel(worst.run)} (${fmt(area, 3)} mm²), thinner than the ${limit} mm² ${elv ? `the ${c.jurisdiction?.toUpperCase()} ELV lighting rules ask` : 'the trade uses'} for this run.`,
    value,
    limit,
    'mm²',
    reference,
    `Use ${next ?? 'a larger size'} or larger (set cable.minCrossSectionMm2 to ${limit}${elv ? ', or leave it out to apply the jurisdiction’s minimum' : ''}).`,
  );
}

/**
 * A drop of 100 % or more is the Ohm's-law figure of a run that cannot work: no voltage would be
 * left at the strip, so the current assumed could not flow (see the voltage-drop calculation's
 * `drop_exceeds_supply`). Said in the failing check rather than shown as if real.
 */
function beyondSupply(dropPercent: number): string {
  return dropPercent >= 100 ? ' — as large as the supply itself: no voltage would reach the strip, so these figures describe a run that cannot work' : '';
}
