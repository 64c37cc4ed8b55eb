import type { EstimateCableLine } from '../../schemas/estimate.js';
import { round } from '../trace.js';
import { setSize, type RunCable } from './run-cable.js';
import type { CableSettings, Settings } from './settings.js';
import type { Feeder } from './supply.js';
import type { TreadPixelPart } from './tread-pixels.js';
import type { TreadStripPart } from './tread-strips.js';

export type CableUseKind = EstimateCableLine['use'];

/** One cable the design needs: what it is for, its sizing and how much of it is laid. */
export interface CableUse {
  use: CableUseKind;
  cores: number;
  run: RunCable;
  /** Cable actually laid for this use, m (count × length for identical feeders). */
  laidLengthM: number;
  /** Whether power flows in it (data-only leads and links carry none). */
  powered: boolean;
  /** Tread the run ends at (tread leads, chain leads), or the first of a feed group. */
  tread: number | null;
  /** Lit landing a tread lead runs to instead of a tread (issue 8). */
  landing?: number;
  lastTread: number | null;
  /** Feeder target, for messages. */
  feederTo: 'controller' | 'pixel feed point' | null;
  controller: number | null;
  count: number;
  /** Feed point along a pixel run (feeders). */
  feedPoint?: number | null;
  circuit?: number;
}

/** Names a run in a check message; built only when a message needs it. */
export function describeUse(use: CableUse): string {
  switch (use.use) {
    case 'tread leads':
      return use.landing !== undefined ? `the lead to landing ${use.landing}` : `the lead to tread ${use.tread}`;
    case 'chain leads':
      return `the data lead to tread ${use.tread}`;
    case 'data links':
      return `the data link into tread ${use.tread}`;
    case 'chain links':
      return `the chain links of treads ${use.tread}–${use.lastTread}`;
    case 'feeders':
      return use.feederTo === 'controller' ? `the feeder to controller ${use.controller}` : `the feeder to pixel feed point ${use.feedPoint ?? ''}`.trimEnd();
  }
}

function sameSize(a: RunCable, b: RunCable): boolean {
  return a.size === null ? b.size === null : b.size !== null && a.areaMm2 === b.areaMm2;
}

/** Cable by use, size and cores, with metres to order (rounded up to whole metres). */
export function cableSchedule(uses: readonly CableUse[], cable: CableSettings): EstimateCableLine[] {
  // A design has a handful of distinct lines: a linear search beats building string keys.
  const firsts: CableUse[] = [];
  const runs: number[] = [];
  const metres: number[] = [];
  for (const u of uses) {
    let i = 0;
    while (i < firsts.length) {
      const f = firsts[i] as CableUse;
      if (f.use === u.use && f.cores === u.cores && sameSize(f.run, u.run)) break;
      i++;
    }
    if (i === firsts.length) {
      firsts.push(u);
      runs.push(0);
      metres.push(0);
    }
    runs[i] = (runs[i] as number) + u.count;
    metres[i] = (metres[i] as number) + u.laidLengthM;
  }
  const out: EstimateCableLine[] = new Array(firsts.length);
  for (let i = 0; i < firsts.length; i++) {
    const f = firsts[i] as CableUse;
    const exactM = metres[i] as number;
    const line: EstimateCableLine = { cores: f.cores, use: f.use, runs: runs[i] as number, totalLengthM: round(exactM, 3), orderLengthM: Math.ceil(exactM - 1e-9) };
    setSize(line, cable, f.run);
    out[i] = line;
  }
  return out;
}

/** Every cable of the design: tread leads, chain leads and links, data links and feeders. */
export function cableUsesOf(
  treadStrips: TreadStripPart | null,
  treadPixels: TreadPixelPart | null,
  feeders: readonly Feeder[],
  settings: Settings,
): CableUse[] {
  const uses: CableUse[] = [];
  if (treadStrips) {
    treadStrips.leads.forEach((run, k) => {
      // A tread where no strip fits gets no lead: nothing is ordered for it.
      if (run.currentA <= 0) return;
      uses.push({ use: 'tread leads', cores: 2, run, laidLengthM: run.lengthM, powered: true, tread: k + 1, lastTread: null, feederTo: null, controller: null, count: 1 });
    });
    // Lit landings (issue 8): a lead each, like a tread's.
    treadStrips.landingLeads.forEach((run, j) => {
      const landing = treadStrips.landingRows[j]?.landing as number;
      uses.push({ use: 'tread leads', cores: 2, run, laidLengthM: run.lengthM, powered: true, tread: null, landing, lastTread: null, feederTo: null, controller: null, count: 1 });
    });
  }
  if (treadPixels) {
    for (const c of treadPixels.chains) {
      uses.push({ use: 'chain leads', cores: 2, run: c.lead, laidLengthM: c.lead.lengthM, powered: false, tread: c.firstTread, lastTread: null, feederTo: null, controller: c.controller, count: 1 });
      for (const g of c.groups) {
        if (!g.cable) continue;
        uses.push({
          use: 'chain links',
          cores: 3,
          run: g.cable,
          laidLengthM: g.linksLengthM,
          powered: g.cable.currentA > 0,
          tread: g.firstTread,
          lastTread: g.lastTread,
          feederTo: null,
          controller: c.controller,
          count: g.lastTread - g.firstTread,
        });
      }
    }
    for (const d of treadPixels.dataCables) {
      if (d.kind === 'data links') {
        uses.push({ use: 'data links', cores: 2, run: d.cable, laidLengthM: d.cable.lengthM, powered: false, tread: d.tread, lastTread: null, feederTo: null, controller: null, count: 1 });
      }
    }
  }
  for (const f of feeders) {
    // Nothing to feed (no strip fits): no feeder to lay.
    if (f.target.currentA <= 0) continue;
    uses.push({
      use: 'feeders',
      cores: 2,
      run: f.run,
      laidLengthM: f.run.lengthM,
      powered: f.target.currentA > 0,
      tread: f.target.firstTread,
      lastTread: f.target.lastTread,
      feederTo: f.target.to,
      controller: f.target.controller,
      count: 1,
      feedPoint: f.target.feedPoint,
      circuit: f.circuit,
    });
  }
  return uses;
}
