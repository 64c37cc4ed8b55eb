import type { EstimateTread, TreadStripInput } from '../../schemas/estimate.js';
import type { StairGeometry } from '../geometry.js';
import { allocateOutputs, outputsTrace, type OutputAllocation } from '../outputs.js';
import { cvLoad, cvLoadTrace, fitStrip, stripFitTrace, type CvLoad, type StripFit } from '../strip.js';
import { round, type TraceEntry } from '../trace.js';
import { setSize, sizeRun, type RunCable } from './run-cable.js';
import type { Settings } from './settings.js';
import { runsTrace, stairRuns, type StairRuns } from './stair.js';

export interface TreadStripPart {
  strip: TreadStripInput;
  fit: StripFit;
  /** Load of one lit tread (every tread has the stair's width, so every piece is the same). */
  load: CvLoad;
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
  const fit = fitStrip(stair.treadWidthMm as number, strip.cutPitchMm, strip.endClearanceMm);
  const load = fit.fits ? cvLoad(fit.stripLengthMm, strip.powerWPerM, strip.voltageV) : NO_LOAD;
  const treadCurrentsA: number[] = new Array(n).fill(load.currentA);
  const allocationInput = { treadCurrentsA, profile: settings.profile };
  const allocation = allocateOutputs(allocationInput);

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
  const treadPowerW = round(load.powerW);
  const treadCurrentA = round(load.currentA);
  for (let k = 0; k < n; k++) {
    const lead = sizeRun(strip.voltageV, load.currentA, runs.runsM[k] as number, settings.cable);
    leads[k] = lead;
    totalLoadW += load.powerW;
    totalCurrentA += load.currentA;
    const row: EstimateTread = {
      index: k + 1,
      stripLengthMm: fit.stripLengthMm,
      powerW: treadPowerW,
      currentA: treadCurrentA,
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

  trace.push(
    stripFitTrace(stair.treadWidthMm as number, strip.cutPitchMm, strip.endClearanceMm, fit),
    ...cvLoadTrace(fit.stripLengthMm, strip.powerWPerM, strip.voltageV, load, 'tread.powerW'),
    {
      quantity: 'treadStrips.totalLoadW',
      value: round(totalLoadW),
      unit: 'W',
      formula: 'Σ tread powers (every tread the same width)',
      inputs: { treads: n, litTreads: fit.fits ? n : 0, treadPowerW: round(load.powerW) },
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
    load,
    litTreads: fit.fits ? n : 0,
    allocation,
    runs,
    leads,
    rows,
    totalLoadW,
    totalCurrentA,
    controllerCurrentsA,
  };
}
