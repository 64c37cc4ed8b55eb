import type { EstimateCheck } from '../../schemas/estimate.js';
import { CIRCUIT_REFERENCE, class2MaxVA, DEFAULT_DRIVER_RATINGS_W, DEFAULT_MAX_LOADING_PERCENT, requiredRatingW } from '../drivers.js';
import { flagged, fmt, passed, type Design } from './checks.js';
import { chainsOf, type SupplyRail } from './supply.js';
import type { Circuit, Feeder } from './circuits.js';
import { sizeLabel } from './run-cable.js';
import { FUSE_OPENING_FACTOR, fuseFor, PROTECTION_REFERENCE } from '../protection.js';
import { round } from '../trace.js';

const LOADING_REFERENCE =
  'common practice, no published source (80 % loading); closest published rule NEC 210.19(A)(1) / 215.2(A)(1): 125 % of a continuous load';
const CLASS2_REFERENCE =
  'NEC Chapter 9 Table 11(B): 20–60 V DC 100 VA; 0–20 V 5 × Vmax VA and 5 A (from memory); UL 1310; Class 2 supplies not paralleled or interconnected: NEC 725.121(B) 2017/2020, 725.60(B) 2023 (from memory)';
const SELV_REFERENCE =
  'IEC 61140 / IEC 60364-4-41: SELV ≤ 120 V ripple-free DC; IEC 60598-1 8.2.3: exposed live parts of Class III luminaires ≤ 60 V ripple-free DC';

function circuitsText(rail: SupplyRail): string {
  return rail.circuits
    .filter((c) => c.loadW > 0)
    .map((c) => `${c.response.name}: ${c.ratingW === null ? 'no driver' : `${c.ratingW} W`} for ${fmt(c.loadW, 1)} W${c.loadingPercent === null ? '' : ` (${fmt(c.loadingPercent, 1)} %)`}`)
    .join('; ');
}

/** What to do when one feed is more than any single driver may carry. */
function oversizeAdvice(c: Circuit, capW: number, voltageV: number): string {
  if (c.kind === 'tread strips') {
    const controllers = Math.ceil(c.loadW / capW);
    return `Fit ${controllers} controllers instead of one and split the treads between them, each controller on its own driver of at most ${fmt(capW, 1)} W load; or add a ${voltageV} V driver of at least ${fmt(requiredRatingW(c.loadW), 1)} W. Drivers are not paralleled onto one power input.`;
  }
  return `Feed the pixels at more points (a shorter maxFeedLengthM) so each feed draws at most ${fmt(capW, 1)} W, or add a ${voltageV} V driver of at least ${fmt(requiredRatingW(c.loadW), 1)} W.`;
}

export function driverLoadingCheck(d: Design): EstimateCheck {
  const rails = d.supplies.rails.filter((r) => r.loadW > 0);
  const max = d.settings.drivers.maxLoadingPercent;
  if (rails.length === 0) return passed('driver-loading', 'Nothing draws power, so no driver is needed.', 0, max, '%', LOADING_REFERENCE);

  const unsupplied = rails.find((r) => r.noUsableRating);
  if (unsupplied) {
    const cap = unsupplied.maxSupplyW;
    const required = requiredRatingW(unsupplied.loadW, max);
    const count = cap ? Math.ceil(required / cap) : 1;
    return flagged(
      'driver-loading',
      'fail',
      `No available driver rating can supply the ${unsupplied.voltageV} V rail${cap ? ` within the ${cap} W cap per supply` : ''}.`,
      null,
      max,
      '%',
      LOADING_REFERENCE,
      cap
        ? `Add ${unsupplied.voltageV} V drivers of at most ${cap} W: ${count} separate circuits of ${fmt(unsupplied.loadW / count, 1)} W each, each on its own driver of ${Math.ceil(required / count)} W or more; or turn off class2.`
        : `Add ${unsupplied.voltageV} V driver ratings covering ${fmt(required, 1)} W.`,
    );
  }
  for (const r of rails) {
    const over = r.circuits.find((c) => c.oversize);
    if (!over) continue;
    const ratings = r.response.drivers.map((g) => g.ratingW);
    const largest = ratings.length > 0 ? Math.max(...ratings) : 0;
    const capW = ((r.maxSupplyW ?? largestAvailable(d, r)) * max) / 100;
    return flagged(
      'driver-loading',
      'fail',
      `${capitalise(over.response.name)} draws ${fmt(over.loadW, 1)} W on one power input: it needs a single driver of ${fmt(requiredRatingW(over.loadW, max), 1)} W and none is available${largest > 0 ? ` (largest used ${largest} W)` : ''}. Drivers are not paralleled to make up a rating.`,
      null,
      max,
      '%',
      `${LOADING_REFERENCE}; ${CIRCUIT_REFERENCE}`,
      oversizeAdvice(over, capW, r.voltageV),
    );
  }

  let worst = rails[0] as SupplyRail;
  for (const r of rails) if ((r.response.loadingPercent ?? 0) > (worst.response.loadingPercent ?? 0)) worst = r;
  const loading = worst.response.loadingPercent ?? 0;
  const summary = rails.map((r) => `${r.voltageV} V, one driver per circuit — ${circuitsText(r)}`).join('; ');
  if (max > DEFAULT_MAX_LOADING_PERCENT) {
    return flagged(
      'driver-loading',
      'warn',
      `${summary}; the limit was set to ${max} %, above the 80 % the trade allows.`,
      loading,
      max,
      '%',
      LOADING_REFERENCE,
      `Keep maxLoadingPercent at ${DEFAULT_MAX_LOADING_PERCENT}: ${rails.map((r) => `${r.voltageV} V needs ${fmt(requiredRatingW(r.loadW), 1)} W of drivers`).join(', ')}.`,
    );
  }
  return passed('driver-loading', `${summary}, within ${max} %.`, loading, max, '%', LOADING_REFERENCE);
}

/** The largest rating the rail could use (for a cap in messages). */
function largestAvailable(d: Design, r: SupplyRail): number {
  let largest = 0;
  for (const c of r.circuits) if (c.ratingW !== null) largest = Math.max(largest, c.ratingW);
  for (const x of d.settings.drivers.availableRatingsW ?? DEFAULT_DRIVER_RATINGS_W) largest = Math.max(largest, x);
  return largest;
}

function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

export function class2Check(d: Design): EstimateCheck | null {
  if (!d.settings.drivers.class2) return null;
  const rails = d.supplies.rails.filter((r) => r.loadW > 0);
  const over = rails.find((r) => class2MaxVA(r.voltageV) === null);
  if (over) {
    return flagged(
      'class2-limit',
      'fail',
      `Class 2 supplies stop at 60 V DC (30 V in wet locations); the ${over.voltageV} V rail cannot be Class 2.`,
      over.voltageV,
      60,
      'V',
      CLASS2_REFERENCE,
      'Use a 24 V strip: Class 2 allows 100 VA per supply at 24 V.',
    );
  }
  const missing = rails.find((r) => r.noUsableRating);
  if (missing) {
    const c = class2MaxVA(missing.voltageV) as number;
    const n = Math.ceil(requiredRatingW(missing.loadW, d.settings.drivers.maxLoadingPercent) / c);
    return flagged(
      'class2-limit',
      'fail',
      `No available ${missing.voltageV} V rating is within the Class 2 limit of ${c} VA per supply.`,
      null,
      c,
      'VA',
      CLASS2_REFERENCE,
      `Add ${missing.voltageV} V listed Class 2 drivers of at most ${c} W: ${n} separate circuits, each on its own supply, never paralleled.`,
    );
  }
  const max = d.settings.drivers.maxLoadingPercent;
  for (const r of rails) {
    const cap = class2MaxVA(r.voltageV) as number;
    const capW = (cap * max) / 100;
    const big = r.circuits.find((c) => c.oversize);
    if (big) {
      const n = Math.ceil(big.loadW / capW);
      return flagged(
        'class2-limit',
        'fail',
        `${capitalise(big.response.name)} draws ${fmt(big.loadW, 1)} W on one power input, more than one Class 2 supply may give (${cap} VA at ${max} % loading = ${fmt(capW, 1)} W); Class 2 supplies must not be paralleled or interconnected.`,
        round(big.loadW, 4),
        cap,
        'VA',
        CLASS2_REFERENCE,
        big.kind === 'tread strips'
          ? `Split the treads over ${n} controllers of at most ${fmt(capW, 1)} W each, each on its own listed Class 2 supply; or use a non-Class 2 supply with fused circuits.`
          : `Feed the pixels at more points so each draws at most ${fmt(capW, 1)} W, each on its own listed Class 2 supply; or use a non-Class 2 supply with fused circuits.`,
      );
    }
    // A data chain powered from two Class 2 circuits joins their 0 V: an interconnection.
    const owner = new Map<number, number>();
    for (const c of r.circuits) {
      for (const key of chainsOf(c, d.rail)) {
        const first = owner.get(key);
        if (first !== undefined && first !== c.index) {
          const chain = key > 1000 ? `data chain ${key - 1000} of the tread pixels` : `data chain ${key} of the rail`;
          return flagged(
            'class2-limit',
            'fail',
            `${capitalise(chain)} is powered from circuits ${first} and ${c.index}: its shared 0 V would interconnect two Class 2 supplies.`,
            r.circuits.length,
            1,
            'circuits per data chain',
            CLASS2_REFERENCE,
            'Give each Class 2 circuit its own data output (split the run where the circuits meet, with an isolated data link between them), or feed the whole run from one non-Class 2 supply with a fuse per feed point.',
          );
        }
        owner.set(key, c.index);
      }
    }
  }
  let largest = 0;
  let cap: number | null = null;
  let count = 0;
  for (const r of rails) {
    for (const c of r.circuits) if (c.ratingW !== null) largest = Math.max(largest, c.ratingW);
    count += r.circuits.filter((c) => c.loadW > 0).length;
    const c = class2MaxVA(r.voltageV);
    if (c !== null) cap = cap === null ? c : Math.min(cap, c);
  }
  return passed(
    'class2-limit',
    rails.length === 0
      ? 'No driver needed.'
      : `Each of the ${count} circuits has its own Class 2 supply within its limit, none paralleled or interconnected: ${rails.map((r) => `${r.voltageV} V ≤ ${class2MaxVA(r.voltageV)} VA each (${circuitsText(r)})`).join('; ')}.`,
    largest,
    cap,
    'VA',
    CLASS2_REFERENCE,
  );
}

export function circuitProtectionCheck(d: Design): EstimateCheck | null {
  const feeders = d.supplies.feeders.filter((f) => f.target.currentA > 0);
  if (feeders.length === 0) return null;
  const bad = feeders.find((f) => f.protection.protectedBy === 'none');
  const value = (f: Feeder) => round(f.thinnestRatingA, 4);
  if (bad) {
    const circuit = d.supplies.circuits.find((c) => c.index === bad.circuit);
    const limitA = circuit?.response.driver?.currentLimitA ?? null;
    return flagged(
      'circuit-protection',
      'fail',
      `The feeder of circuit ${bad.circuit} to ${bad.target.to === 'controller' ? `controller ${bad.target.controller}` : `pixel feed point ${bad.target.feedPoint}`} carries ${fmt(bad.target.currentA, 3)} A; its thinnest cable is rated ${fmt(bad.thinnestRatingA, 2)} A${limitA !== null ? `, below the driver's ${fmt(limitA, 2)} A current limit,` : ''} and no fuse between 1.25 × I_B and that rating fits, or none the driver could open.`,
      value(bad),
      limitA,
      'A',
      PROTECTION_REFERENCE,
      protectionAdvice(bad, limitA),
    );
  }
  const fuses = feeders.map((f) => (f.protection.fuseA === null ? 'driver limit' : `${f.protection.fuseA} A`));
  let thinnest = feeders[0] as Feeder;
  for (const f of feeders) if (f.thinnestRatingA < thinnest.thinnestRatingA) thinnest = f;
  return passed(
    'circuit-protection',
    `Every feeder is protected: fuses at the drivers ${[...new Set(fuses)].join(', ')}; ${feeders.filter((f) => f.protection.protectedBy === 'driver current limit').length} of ${feeders.length} feeders also carry their driver's full current limit.`,
    value(thinnest),
    null,
    'A',
    PROTECTION_REFERENCE,
  );
}

/** The concrete ways out: cables a fuse can protect, or cables that carry the driver's limit. */
function protectionAdvice(f: Feeder, limitA: number | null): string {
  const fuseA = fuseFor(f.target.currentA, Infinity);
  const parts: string[] = [];
  if (fuseA !== null && (limitA === null || limitA >= FUSE_OPENING_FACTOR * fuseA)) {
    parts.push(`use a feeder${f.target.downstreamRatingA !== null ? ' and links' : ''} rated at least ${fuseA} A, so a ${fuseA} A fuse at the driver protects ${f.target.downstreamRatingA !== null ? 'them' : 'it'}`);
  }
  if (limitA !== null) parts.push(`use cable rated for the driver's ${fmt(limitA, 2)} A limit`);
  parts.push('or split the circuit so a smaller driver feeds it');
  return capitalise(parts.join('; ')) + '.';
}

/** 25 A and more: free-air cord ratings no longer hold once cables are grouped or enclosed. */
export const GROUPING_THRESHOLD_A = 25;

export function feederDeratingCheck(d: Design): EstimateCheck | null {
  let worst: Feeder | null = null;
  for (const f of d.supplies.feeders) if (!worst || f.target.currentA > worst.target.currentA) worst = f;
  if (!worst || worst.target.currentA < GROUPING_THRESHOLD_A) return null;
  return flagged(
    'feeder-derating',
    'warn',
    `A feeder carries ${fmt(worst.target.currentA, 2)} A on ${sizeLabel(worst.run)}, rated for a single cable in free air at 30 °C: grouped, enclosed or insulated runs carry less, and large conductors may not fit the driver's or controller's terminals.`,
    round(worst.target.currentA, 4),
    GROUPING_THRESHOLD_A,
    'A',
    'BS 7671 Appendix 4 rating factors for grouping (Table 4C1) and ambient temperature (Table 4B1), from memory; terminal capacity from the driver and controller datasheets',
    'Derate the feeder for grouping and ambient (choose the next size up if in doubt), confirm the terminals accept it, or split the load over more circuits so each feeder carries less than 25 A.',
  );
}

export function selvCheck(d: Design): EstimateCheck {
  let highest = 0;
  for (const r of d.supplies.rails) highest = Math.max(highest, r.voltageV);
  if (highest <= 60) {
    return passed('selv-voltage', `The highest rail is ${highest} V DC, within SELV and the 60 V limit for exposed live parts.`, highest, 60, 'V', SELV_REFERENCE);
  }
  if (highest <= 120) {
    return flagged(
      'selv-voltage',
      'warn',
      `The ${highest} V DC rail is SELV (≤ 120 V) but above the 60 V allowed for exposed live parts of a Class III luminaire.`,
      highest,
      60,
      'V',
      SELV_REFERENCE,
      'Enclose the strip and every joint in profile with a diffuser and end caps, or use a 24 V strip.',
    );
  }
  return flagged(
    'selv-voltage',
    'fail',
    `${highest} V DC is above the 120 V SELV limit: this is not extra-low-voltage wiring.`,
    highest,
    120,
    'V',
    SELV_REFERENCE,
    'Use a 24 V (or at most 48 V) strip; wiring above SELV is work for a licensed electrician under local codes.',
  );
}
