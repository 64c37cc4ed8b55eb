import type { EstimateCheck } from '../../schemas/estimate.js';
import { class2MaxVA, DEFAULT_MAX_LOADING_PERCENT, requiredRatingW } from '../drivers.js';
import { flagged, fmt, passed, type Design } from './checks.js';
import type { SupplyRail } from './supply.js';

const LOADING_REFERENCE =
  'common practice, no published source (80 % loading); closest published rule NEC 210.19(A)(1) / 215.2(A)(1): 125 % of a continuous load';
const CLASS2_REFERENCE = 'NEC Chapter 9 Table 11(B): 20–60 V DC 100 VA; 0–20 V 5 × V VA (from memory); UL 1310';
const SELV_REFERENCE =
  'IEC 61140 / IEC 60364-4-41: SELV ≤ 120 V ripple-free DC; IEC 60598-1 8.2.3: exposed live parts of Class III luminaires ≤ 60 V ripple-free DC';

function mixText(rail: SupplyRail): string {
  return rail.response.drivers.map((g) => `${g.count} × ${g.ratingW} W`).join(' + ');
}

export function driverLoadingCheck(d: Design): EstimateCheck {
  const rails = d.supplies.rails.filter((r) => r.loadW > 0);
  const max = d.settings.drivers.maxLoadingPercent;
  if (rails.length === 0) return passed('driver-loading', 'Nothing draws power, so no driver is needed.', 0, max, '%', LOADING_REFERENCE);

  const unsupplied = rails.find((r) => !r.result || r.result.driverCount === 0);
  if (unsupplied) {
    const cap = unsupplied.result?.maxSupplyW ?? null;
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
        ? `Add ${unsupplied.voltageV} V drivers of at most ${cap} W: ${count} × ${Math.ceil(required / count)} W or more cover ${fmt(required, 1)} W; or turn off class2.`
        : `Add ${unsupplied.voltageV} V driver ratings covering ${fmt(required, 1)} W.`,
    );
  }

  let worst = rails[0] as SupplyRail;
  for (const r of rails) if ((r.result?.loadingPercent ?? 0) > (worst.result?.loadingPercent ?? 0)) worst = r;
  const loading = worst.result?.loadingPercent ?? 0;
  const summary = rails.map((r) => `${r.voltageV} V: ${mixText(r)} carry ${fmt(r.loadW, 1)} W (${fmt(r.result?.loadingPercent ?? 0, 1)} %)`).join('; ');
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
  let largest = 0;
  let cap: number | null = null;
  for (const r of rails) {
    for (const g of r.response.drivers) largest = Math.max(largest, g.ratingW);
    const c = class2MaxVA(r.voltageV);
    if (c !== null) cap = cap === null ? c : Math.min(cap, c);
  }
  const missing = rails.find((r) => r.response.driverCount === 0);
  if (missing) {
    const c = class2MaxVA(missing.voltageV) as number;
    return flagged(
      'class2-limit',
      'fail',
      `No available ${missing.voltageV} V rating is within the Class 2 limit of ${c} VA per supply.`,
      null,
      c,
      'VA',
      CLASS2_REFERENCE,
      `Add ${missing.voltageV} V Class 2 drivers of at most ${c} W (${Math.ceil(requiredRatingW(missing.loadW, d.settings.drivers.maxLoadingPercent) / c)} of them).`,
    );
  }
  return passed(
    'class2-limit',
    rails.length === 0
      ? 'No driver needed.'
      : `Every supply is within its Class 2 limit: ${rails.map((r) => `${r.voltageV} V ${mixText(r)} (≤ ${class2MaxVA(r.voltageV)} VA each)`).join('; ')}.`,
    largest,
    cap,
    'VA',
    CLASS2_REFERENCE,
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
