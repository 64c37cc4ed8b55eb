import type { EstimateOutputs, EstimateResult } from '../../schemas/estimate.js';
import type { PixelCurrentBasis } from '../strip.js';
import type { DataLines } from './data-lines.js';
import { round } from '../trace.js';
import type { DataOutputUse, RailPart } from './rail-pixels.js';
import type { Settings } from './settings.js';
import type { TreadPixelPart } from './tread-pixels.js';
import type { TreadStripPart } from './tread-strips.js';

/**
 * One row per stretch of identical data outputs: consecutive outputs of one controller that
 * drive the same number of rail pixels share a row (`output` … `lastOutput`, `count` of them),
 * so the answer grows with controllers, not with outputs × pixels. Tread outputs name their
 * treads, so each keeps a row of its own.
 */
export function addData(into: EstimateOutputs['data'], run: 'rail' | 'treads', uses: readonly DataOutputUse[]): void {
  for (const u of uses) {
    const last = into.at(-1);
    const same =
      last !== undefined &&
      last.run === run &&
      last.controller === u.controller &&
      last.lastOutput + 1 === u.output &&
      last.pixels === u.pixels &&
      last.firstTread === null &&
      u.firstTread === null &&
      last.lastTread === null &&
      u.lastTread === null;
    if (same) {
      last.lastOutput = u.output;
      last.count += 1;
    } else {
      into.push({ controller: u.controller, output: u.output, lastOutput: u.output, count: 1, run, pixels: u.pixels, firstTread: u.firstTread, lastTread: u.lastTread });
    }
  }
}

/** The response's `outputs`: controllers, their blocks of treads, CV and data outputs. */
export function outputsOf(
  settings: Settings,
  controllers: number,
  treadStrips: TreadStripPart | null,
  treadPixels: TreadPixelPart | null,
  rail: RailPart | null,
): EstimateOutputs {
  const { profile } = settings;
  const data: EstimateOutputs['data'] = [];
  if (rail) addData(data, 'rail', rail.dataOutputs);
  if (treadPixels) addData(data, 'treads', treadPixels.dataOutputs);

  const controllerTreads: EstimateOutputs['controllerTreads'] = [];
  const blocks = treadStrips?.runs.blocks ?? treadPixels?.runs.blocks ?? [];
  for (const b of blocks) {
    const cv = treadStrips?.allocation.controllers[b.controller - 1];
    controllerTreads.push({ controller: b.controller, firstTread: b.firstTread, lastTread: b.lastTread, atTread: b.atTread, currentA: round(cv?.currentA ?? 0) });
  }
  return {
    controllers,
    controllerTreads,
    cvOutputsPerController: profile.outputs,
    maxCurrentPerOutputA: profile.maxCurrentPerOutputA,
    maxOutputCurrentA: round(treadStrips?.allocation.maxOutputCurrentA ?? 0),
    cv: (treadStrips?.allocation.outputs ?? []).map((o) => ({
      controller: o.controller,
      output: o.output,
      treads: o.treads,
      ...(o.landings ? { landings: o.landings } : {}),
      currentA: round(o.currentA),
      withinLimit: o.withinLimit,
    })),
    dataOutputsPerController: profile.dataOutputs ?? 0,
    data,
  };
}

/** The response's `pixels`: the rail run and the chained tread run, where the layout has them. */
export function pixelsOf(rail: RailPart | null, treadPixels: TreadPixelPart | null): EstimateResult['pixels'] {
  return {
    rail: rail
      ? {
          run: 'rail',
          pixels: rail.pixels,
          lengthM: rail.rail.lengthM,
          pixelsPerM: rail.rail.pixelsPerM,
          voltageV: rail.rail.voltageV,
          protocol: rail.rail.protocol,
          bitsPerPixel: rail.rail.protocol === 'clocked' ? 32 : (rail.rail.bitsPerPixel ?? 24),
          dataOutputs: rail.dataOutputsNeeded,
          pixelsPerOutput: rail.data.pixelsPerOutput,
          frameTimeUs: rail.data.frameTimeUs,
          maxRefreshHz: rail.data.maxRefreshHz,
          fullWhiteCurrentA: round(rail.currentA),
          powerW: round(rail.powerW),
          brightnessPercent: rail.rail.brightnessPercent ?? 100,
          ...currentFields(rail.current, rail.uncappedCurrentA, rail.rail.voltageV, rail.sizingBrightnessPercent),
          feedPoints: rail.feedPoints,
          injectionPoints: rail.injection.injectionPoints,
          maxFeedLengthM: round(rail.injection.maxFeedLengthM, 3),
          maxFeedCurrentA: rail.maxFeedCurrentA,
          dataGaps: gapsOf(rail.dataLines),
        }
      : null,
    treads: treadPixels
      ? {
          run: 'treads',
          pixels: treadPixels.totalPixels,
          lengthM: round(treadPixels.litPiecesMm.reduce((sum, mm) => sum + mm, 0) / 1000, 3),
          pixelsPerM: treadPixels.block.pixelsPerM,
          voltageV: treadPixels.block.voltageV,
          protocol: treadPixels.block.protocol,
          bitsPerPixel: treadPixels.block.protocol === 'clocked' ? 32 : (treadPixels.block.bitsPerPixel ?? 24),
          dataOutputs: treadPixels.chains.length,
          pixelsPerOutput: treadPixels.busiestChainPixels,
          frameTimeUs: treadPixels.data.frameTimeUs,
          maxRefreshHz: treadPixels.data.maxRefreshHz,
          fullWhiteCurrentA: round(treadPixels.totalCurrentA),
          powerW: round(treadPixels.totalLoadW),
          brightnessPercent: treadPixels.block.brightnessPercent ?? 100,
          ...currentFields(treadPixels.current, treadPixels.uncappedCurrentA, treadPixels.block.voltageV, treadPixels.sizingBrightnessPercent),
          feedPoints: treadPixels.feedGroups.length,
          injectionPoints: treadPixels.feedGroups.length - treadPixels.chains.length,
          maxFeedLengthM: round(treadPixels.injection.maxFeedLengthM, 3),
          maxFeedCurrentA: treadPixels.maxFeedCurrentA,
          chainCableLengthM: round(treadPixels.chainCableLengthM, 3),
          dataGaps: gapsOf(treadPixels.dataLines),
        }
      : null,
    railGrouping: rail?.grouping ?? null,
  };
}

/** The current per pixel behind a run's load, and its load with no brightness cap. */
function currentFields(current: PixelCurrentBasis, uncappedCurrentA: number, voltageV: number, sizedForBrightnessPercent: number) {
  return {
    currentPerPixelMa: round(current.currentPerPixelMa, 4),
    currentPerPixelSource: current.source,
    uncappedCurrentA: round(uncappedCurrentA),
    uncappedPowerW: round(uncappedCurrentA * voltageV),
    sizedForBrightnessPercent,
  };
}

function gapsOf(lines: DataLines) {
  return lines.gaps.map((g) => ({ kind: g.kind, controller: g.controller, output: g.output, tread: g.tread, lengthM: round(g.lengthM, 3), limitM: g.limitM, withinLimit: g.withinLimit }));
}
