import type { EstimateLanding, EstimateTread, TreadStripInput } from '../../schemas/estimate.js';
import { treadPositionsM, treadWidthsOf, type StairGeometry } from '../geometry.js';
import { allocationInTreads, lightingSequence, litLandingsOf } from './lit-landings.js';
import { allocateOutputs, outputsTrace, type OutputAllocation } from '../outputs.js';
import { cvLoad, cvLoadTrace, fitStrip, stripFitTrace, type CvLoad, type StripFit } from '../strip.js';
import { round, type TraceEntry } from '../trace.js';
import { setSize, sizeRun, type RunCable } from './run-cable.js';
import type { Settings } from './settings.js';
import { runsTrace, stairRuns, type BlockRuns, type StairRuns } from './stair.js';

export interface TreadStripPart {
  strip: TreadStripInput;
  /** Fit of the narrowest tread (the one that fails first); every tread's is in `fits`. */
  fit: StripFit;
  /** Width of that narrowest tread, mm. */
  narrowestWidthMm: number;
  /** Load of the tread that draws most (every tread alike unless the stair lists its widths). */
  load: CvLoad;
  /** Fit of that tread. */
  largestFit: StripFit;
  /** Fit and load of every tread, foot first. */
  fits: StripFit[];
  loads: CvLoad[];
  /** Strip cut for each lit tread, mm, and the tread it is for. */
  litPiecesMm: number[];
  litPieceTreads: number[];
  /** Lit landings: their leads and schedule rows (empty without lit landings). */
  landingLeads: RunCable[];
  landingRows: EstimateLanding[];
  litTreads: number;
  allocation: OutputAllocation;
  runs: StairRuns;
  leads: RunCable[];
  rows: EstimateTread[];
  totalLoadW: number;
  totalCurrentA: number;
  /** CV current each controller passes, in controller order. */
  controllerCurrentsA: number[];
}

const NO_LOAD: CvLoad = Object.freeze({ powerW: 0, currentA: 0 });

/** tread-strips: a CV strip per tread, one tread per output, a lead from the controller to each tread. */
export function sizeTreadStrips(stair: StairGeometry, strip: TreadStripInput, settings: Settings, trace: TraceEntry[]): TreadStripPart {
  const n = stair.treads;
  // Each tread's own width (winders, a bullnose step) or the stair's: equal widths share one fit.
  const widths = treadWidthsOf(stair);
  const byWidth = new Map<number, { fit: StripFit; load: CvLoad }>();
  const fits: StripFit[] = new Array(n);
  const loads: CvLoad[] = new Array(n);
  const litPiecesMm: number[] = [];
  const litPieceTreads: number[] = [];
  let narrowest = 0;
  let largest = 0;
  for (let k = 0; k < n; k++) {
    const width = widths[k] as number;
    let one = byWidth.get(width);
    if (!one) {
      const f = fitStrip(width, strip.cutPitchMm, strip.endClearanceMm);
      one = { fit: f, load: f.fits ? cvLoad(f.stripLengthMm, strip.powerWPerM, strip.voltageV) : NO_LOAD };
      byWidth.set(width, one);
    }
    fits[k] = one.fit;
    loads[k] = one.load;
    if (one.fit.fits) {
      litPiecesMm.push(one.fit.stripLengthMm);
      litPieceTreads.push(k + 1);
    }
    if (width < (widths[narrowest] as number)) narrowest = k;
    if (one.load.currentA > (loads[largest] as CvLoad).currentA) largest = k;
  }
  const fit = fits[narrowest] as StripFit;
  const load = loads[largest] as CvLoad;
  const treadCurrentsA: number[] = loads.map((l) => l.currentA);
  // Lit landings light in the sequence between their flights, each on an output of its own.
  const landings = litLandingsOf(stair, stair.litLandings);
  const landingFit = fitStrip(stair.treadWidthMm as number, strip.cutPitchMm, strip.endClearanceMm);
  const landingLoad = landingFit.fits ? cvLoad(landingFit.stripLengthMm, strip.powerWPerM, strip.voltageV) : NO_LOAD;
  const sequence = lightingSequence(n, landings);
  const allocationInput = {
    treadCurrentsA: landings.length > 0 ? sequence.map((i) => (i.tread !== undefined ? (treadCurrentsA[i.tread - 1] as number) : landingLoad.currentA)) : treadCurrentsA,
    profile: settings.profile,
  };
  const allocation = allocateOutputs(allocationInput);
  if (landings.length > 0) allocationInTreads(allocation, sequence);

  // Without CV outputs no controller can take a tread; the runs are still measured from one.
  const blocks = allocation.controllers.length > 0 ? allocation.controllers : [{ firstTread: 1, lastTread: n }];
  const runs = stairRuns(stair, blocks, settings.position, settings.cable.serviceAllowanceGiven);

  const controllerOf = new Int32Array(n);
  const outputOf = new Int32Array(n);
  for (const o of allocation.outputs) {
    for (const t of o.treads) {
      controllerOf[t - 1] = o.controller;
      outputOf[t - 1] = o.output;
    }
  }

  const leads: RunCable[] = new Array(n);
  const rows: EstimateTread[] = new Array(n);
  let totalLoadW = 0;
  let totalCurrentA = 0;
  for (let k = 0; k < n; k++) {
    const treadLoad = loads[k] as CvLoad;
    const lead = sizeRun(strip.voltageV, treadLoad.currentA, runs.runsM[k] as number, settings.cable);
    leads[k] = lead;
    totalLoadW += treadLoad.powerW;
    totalCurrentA += treadLoad.currentA;
    const row: EstimateTread = {
      index: k + 1,
      stripLengthMm: (fits[k] as StripFit).stripLengthMm,
      powerW: round(treadLoad.powerW),
      currentA: round(treadLoad.currentA),
      controller: controllerOf[k] || null,
      output: outputOf[k] || null,
      cableKind: 'tread-lead',
      cableLengthM: round(lead.lengthM, 3),
      dropPercent: round(lead.dropPercent, 3),
    };
    setSize(row, settings.cable, lead);
    rows[k] = row;
  }
  const controllerCurrentsA = allocation.controllers.map((c) => c.currentA);

  // Each lit landing: a lead from the controller whose block holds the tread below it.
  const positions = landings.length > 0 ? treadPositionsM(stair) : null;
  const landingLeads: RunCable[] = [];
  const landingRows: EstimateLanding[] = [];
  landings.forEach((l, j) => {
    const block = runs.blocks.find((b) => l.belowTread >= b.firstTread && l.belowTread <= b.lastTread) ?? (runs.blocks[0] as BlockRuns);
    const lengthM = Math.abs(l.positionM - ((positions as Float64Array)[block.atTread - 1] as number)) + settings.cable.serviceAllowanceM;
    const lead = sizeRun(strip.voltageV, landingLoad.currentA, lengthM, settings.cable);
    landingLeads.push(lead);
    const out = allocation.outputs.find((o) => o.landings?.includes(l.landing));
    const row: EstimateLanding = {
      landing: l.landing,
      belowTread: l.belowTread,
      stripLengthMm: landingFit.stripLengthMm,
      powerW: round(landingLoad.powerW),
      currentA: round(landingLoad.currentA),
      controller: out?.controller ?? null,
      output: out?.output ?? null,
      cableLengthM: round(lead.lengthM, 3),
      dropPercent: round(lead.dropPercent, 3),
    };
    setSize(row, settings.cable, lead);
    landingRows.push(row);
    totalLoadW += landingLoad.powerW;
    totalCurrentA += landingLoad.currentA;
    if (landingFit.fits) {
      litPiecesMm.push(landingFit.stripLengthMm);
      // Reel plans count pieces from 0 by tread; lit landings follow the treads (n + 1, n + 2, …).
      litPieceTreads.push(n + j + 1);
    }
  });

  trace.push(
    stripFitTrace(widths[narrowest] as number, strip.cutPitchMm, strip.endClearanceMm, fit),
    ...cvLoadTrace((fits[largest] as StripFit).stripLengthMm, strip.powerWPerM, strip.voltageV, load, 'tread.powerW'),
    {
      quantity: 'treadStrips.totalLoadW',
      value: round(totalLoadW),
      unit: 'W',
      formula: byWidth.size > 1 ? 'Σ tread powers (each tread its own width)' : 'Σ tread powers (every tread the same width)',
      inputs: { treads: n, litTreads: litPiecesMm.length, treadPowerW: round(load.powerW) },
      reference: 'arithmetic',
    },
    {
      quantity: 'treadStrips.totalCurrentA',
      value: round(totalCurrentA),
      unit: 'A',
      formula: 'I = P / V',
      inputs: { totalLoadW: round(totalLoadW), voltageV: strip.voltageV },
      reference: 'P = V·I',
    },
    ...outputsTrace(allocationInput, allocation),
    ...runsTrace(stair, runs, settings.position, settings.cable.serviceAllowanceGiven),
  );

  return {
    strip,
    fit,
    narrowestWidthMm: widths[narrowest] as number,
    load,
    largestFit: fits[largest] as StripFit,
    fits,
    loads,
    litPiecesMm,
    litPieceTreads,
    litTreads: litPiecesMm.length - (landingFit.fits ? landings.length : 0),
    landingLeads,
    landingRows,
    allocation,
    runs,
    leads,
    rows,
    totalLoadW,
    totalCurrentA,
    controllerCurrentsA,
  };
}
