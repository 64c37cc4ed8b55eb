import type { ControllerProfile } from '../../schemas/controller.js';
import type { EstimateTread, TreadPixelsBlock } from '../../schemas/estimate.js';
import type { PixelsResult } from '../../schemas/pixels.js';
import { bestControllerTread, treadPositionsM, treadWidthsOf, type ControllerPosition, type StairGeometry } from '../geometry.js';
import { blockSizes } from '../outputs.js';
import { DEFAULT_MAX_FEED_CURRENT_A, injectionPoints, injectionTrace, pixelData, type InjectionPlan } from '../pixels.js';
import { fitPixelStrip, pixelCurrentA, pixelCurrentBasis, pixelCurrentTrace, stripFitTrace, type PixelCurrentBasis, type PixelPiece, type StripFit } from '../strip.js';
import { round, type TraceEntry } from '../trace.js';
import { dropPercentOf, loopDropV } from '../voltage-drop.js';
import { DEFAULT_MAX_UNBUFFERED_DATA_M, dataLines, dataLinesTrace, gap, maxDataLeadM, type DataGap, type DataLines } from './data-lines.js';
import { timingTrace, type DataOutputUse } from './rail-pixels.js';
import { setSize, sizeRun, type RunCable } from './run-cable.js';
import type { Settings } from './settings.js';
import { runsTrace, stairRuns, type StairRuns, type TreadBlock } from './stair.js';

/** Treads fed with power at the first of them; the links inside carry power and data. */
export interface FeedGroup extends TreadBlock {
  currentA: number;
  /** Cable of the links inside the group, sized for the current moment Σ L·I; null for a one-tread group. */
  cable: RunCable | null;
  /** Physical length of those links, m. */
  linksLengthM: number;
}

export interface Chain extends TreadBlock {
  controller: number;
  output: number;
  pixels: number;
  lead: RunCable;
  groups: FeedGroup[];
}

export interface TreadPixelPart {
  block: TreadPixelsBlock;
  fit: StripFit;
  piece: PixelPiece;
  /** Current of one pixel at full white and how it was found. */
  current: PixelCurrentBasis;
  /** Brightness the loads are sized for: the cap, or 100 with sizeForFullWhite. */
  sizingBrightnessPercent: number;
  /** Whole run at full white with no cap, A. */
  uncappedCurrentA: number;
  pixelsPerTread: number;
  litTreads: number;
  /** Strip cut for each lit tread, mm, and the tread it is for. */
  litPiecesMm: number[];
  litPieceTreads: number[];
  /** Width and pixels of the narrowest tread (strip-fits-tread judges it); `fit` is its fit. */
  narrowestWidthMm: number;
  narrowestPixels: number;
  treadCurrentA: number;
  totalPixels: number;
  totalCurrentA: number;
  totalLoadW: number;
  /** Most treads one data output can take under the per-output limit; 0 when one tread is already too many. */
  treadsPerChainLimit: number;
  chains: Chain[];
  controllers: number;
  controllerBlocks: TreadBlock[];
  runs: StairRuns;
  /** Timing of the busiest chain (chains send in parallel). */
  data: PixelsResult;
  busiestChainPixels: number;
  dataOutputs: DataOutputUse[];
  /** Data-only cables (chain leads and links between feed groups). */
  dataCables: { kind: 'chain leads' | 'data links'; tread: number; cable: RunCable }[];
  feedGroups: FeedGroup[];
  chainCableLengthM: number;
  injection: InjectionPlan;
  /** Current limit per feed point used, A (given or the 5 A default). */
  maxFeedCurrentA: number;
  rows: EstimateTread[];
  /** Data gaps: controller → first tread of each chain, and tread to tread. */
  dataLines: DataLines;
}

const NO_PIECE: PixelPiece = Object.freeze({ lengthMm: 0, pixels: 0 });

/** How many controllers and data chains: the per-output limit, the data outputs and the tread range all bound it. */
function planChains(n: number, pixelsPerTread: number, profile: ControllerProfile) {
  const max = profile.maxPixelsPerOutput;
  const limit = max === undefined || pixelsPerTread === 0 ? n : Math.floor(max / pixelsPerTread);
  const perChain = Math.max(1, limit);
  const byLimit = Math.ceil(n / perChain);
  const perController = profile.dataOutputs ?? 0;
  const byData = perController > 0 ? Math.ceil(byLimit / perController) : 1;
  const byRange = profile.maxTreads !== undefined ? Math.ceil(n / profile.maxTreads) : 1;
  const controllers = Math.min(n, Math.max(byData, byRange));
  const chainCount = Math.max(byLimit, controllers);
  return { treadsPerChainLimit: limit, controllers, chainCount };
}

/**
 * Feed groups along one chain: as many as the strip's feed length and the current per feed point
 * ask, more while a group's links cannot keep the drop within the limit or a group draws more
 * than one feed point may push (up to one per tread).
 */
function feedGroups(
  chain: TreadBlock,
  treadCurrentA: number,
  positions: Float64Array,
  block: TreadPixelsBlock,
  settings: Settings,
  startFeeds: number,
  maxFeedCurrentA: number,
): FeedGroup[] {
  const treads = chain.lastTread - chain.firstTread + 1;
  for (let feeds = Math.min(treads, startFeeds); ; feeds++) {
    const groups: FeedGroup[] = [];
    let first = chain.firstTread;
    let ok = true;
    for (const size of blockSizes(treads, feeds)) {
      const group = sizeGroup(first, first + size - 1, treadCurrentA, positions, block.voltageV, settings);
      // Whole treads per group: more feed points while a group draws more than one feed point may push.
      if (group.cable?.failure || group.currentA > maxFeedCurrentA + 1e-9) ok = false;
      groups.push(group);
      first += size;
    }
    if (ok || feeds >= treads) return groups;
  }
}

function linkLengthM(positions: Float64Array, tread: number, settings: Settings): number {
  return (positions[tread - 1] as number) - (positions[tread - 2] as number) + settings.cable.serviceAllowanceM;
}

function sizeGroup(first: number, last: number, treadCurrentA: number, positions: Float64Array, voltageV: number, settings: Settings): FeedGroup {
  const currentA = (last - first + 1) * treadCurrentA;
  if (first === last) return { firstTread: first, lastTread: last, currentA, cable: null, linksLengthM: 0 };
  // The link into tread k carries every tread from k to the group's end.
  let momentAm = 0;
  let linksLengthM = 0;
  for (let k = first + 1; k <= last; k++) {
    const length = linkLengthM(positions, k, settings);
    momentAm += length * (last - k + 1) * treadCurrentA;
    linksLengthM += length;
  }
  const firstLinkA = (last - first) * treadCurrentA;
  // One run with the same current moment drops the same as the chain of links, and carries the largest link current.
  const equivalentLengthM = firstLinkA > 0 ? momentAm / firstLinkA : linksLengthM;
  return { firstTread: first, lastTread: last, currentA, cable: sizeRun(voltageV, firstLinkA, equivalentLengthM, settings.cable), linksLengthM };
}

/**
 * Without a given position each controller sits where its longest data lead (to the first tread
 * of each of its chains) is shortest: for a single chain, at the chain's start.
 */
function chainStartPositions(
  stair: StairGeometry,
  controllerBlocks: TreadBlock[],
  chains: (TreadBlock & { controller: number })[],
  positions: Float64Array,
): ControllerPosition[] {
  return controllerBlocks.map((block, c) => {
    const starts = chains.filter((ch) => ch.controller === c + 1);
    const first = (starts[0] as TreadBlock).firstTread;
    const last = (starts[starts.length - 1] as TreadBlock).firstTread;
    // Chain starts only: the geometry module's best position over the stretch between them.
    const startPositions = Float64Array.from(starts, (ch) => positions[ch.firstTread - 1] as number);
    const best = starts[bestControllerTread(stair, startPositions) - 1] as TreadBlock;
    return { tread: (first === last ? first : best.firstTread) - block.firstTread + 1 };
  });
}

/** tread-pixels: a segment per tread, chained tread to tread on data outputs, power injected per feed group. */
export function sizeTreadPixels(stair: StairGeometry, block: TreadPixelsBlock, settings: Settings, trace: TraceEntry[]): TreadPixelPart {
  const n = stair.treads;
  const { profile } = settings;
  const pitchMm = block.cutPitchMm ?? 1000 / block.pixelsPerM;
  // Each tread's own width (winders, a bullnose step) or the stair's; equal widths share one fit.
  // Chains, feed groups and timing are sized as if every tread held the widest tread's pixels
  // (conservative); rows, totals and reels use each tread's own piece.
  const widths = treadWidthsOf(stair);
  const byWidth = new Map<number, { fit: StripFit; piece: PixelPiece }>();
  const treadPieces: PixelPiece[] = new Array(n);
  let narrowest = 0;
  let widest = 0;
  for (let k = 0; k < n; k++) {
    const width = widths[k] as number;
    let one = byWidth.get(width);
    if (!one) {
      // Whole pixels counted in integers: 30 pixels/m on 960 mm of space is 28 pixels (933.33 mm).
      const f = fitPixelStrip(width, block.pixelsPerM, block.cutPitchMm, block.endClearanceMm);
      one = { fit: f.fit, piece: f.fit.fits && f.piece.pixels > 0 ? f.piece : NO_PIECE };
      byWidth.set(width, one);
    }
    treadPieces[k] = one.piece;
    if (width < (widths[narrowest] as number)) narrowest = k;
    if (one.piece.pixels > (treadPieces[widest] as PixelPiece).pixels) widest = k;
  }
  const fit = (byWidth.get(widths[narrowest] as number) as { fit: StripFit }).fit;
  const piece = treadPieces[widest] as PixelPiece;
  const p = piece.pixels;
  const litPiecesMm: number[] = [];
  const litPieceTreads: number[] = [];
  treadPieces.forEach((tp, k) => {
    if (tp.pixels > 0) {
      litPiecesMm.push(tp.lengthMm);
      litPieceTreads.push(k + 1);
    }
  });
  const current = pixelCurrentBasis(block);
  // Sized for the cap unless the caller asks for full white (the brightness-cap check says which).
  const sizingBrightnessPercent = block.sizeForFullWhite ? 100 : (block.brightnessPercent ?? 100);
  const treadCurrentA = pixelCurrentA(p, current.currentPerPixelMa, sizingBrightnessPercent);
  const treadPowerW = treadCurrentA * block.voltageV;

  const plan = planChains(n, p, profile);
  const chainSizes = blockSizes(n, plan.chainCount);
  const chainsPerController = blockSizes(plan.chainCount, plan.controllers);
  const controllerBlocks: TreadBlock[] = [];
  const chainBlocks: (TreadBlock & { controller: number; output: number })[] = [];
  let tread = 1;
  let chainIndex = 0;
  chainsPerController.forEach((count, c) => {
    const firstTread = tread;
    for (let o = 0; o < count; o++) {
      const size = chainSizes[chainIndex++] as number;
      chainBlocks.push({ firstTread: tread, lastTread: tread + size - 1, controller: c + 1, output: o + 1 });
      tread += size;
    }
    controllerBlocks.push({ firstTread, lastTread: tread - 1 });
  });

  const positions = treadPositionsM(stair);
  const runs = stairRuns(
    stair,
    controllerBlocks,
    settings.position,
    settings.cable.serviceAllowanceGiven,
    settings.position === undefined ? chainStartPositions(stair, controllerBlocks, chainBlocks, positions) : undefined,
  );

  let longest: TreadBlock = chainBlocks[0] as TreadBlock;
  for (const c of chainBlocks) if (c.lastTread - c.firstTread > longest.lastTread - longest.firstTread) longest = c;
  const chainLengthM = (c: TreadBlock) => ((c.lastTread - c.firstTread + 1) * piece.lengthMm) / 1000;
  const maxFeedCurrentA = block.maxFeedCurrentA ?? DEFAULT_MAX_FEED_CURRENT_A;
  const injectionInput = {
    lengthM: chainLengthM(longest),
    voltageV: block.voltageV,
    maxFeedLengthM: block.maxFeedLengthM,
    currentA: (longest.lastTread - longest.firstTread + 1) * treadCurrentA,
    maxFeedCurrentA,
  };
  const injection = injectionPoints(injectionInput);

  const chains: Chain[] = [];
  const allGroups: FeedGroup[] = [];
  const dataCables: TreadPixelPart['dataCables'] = [];
  const rows: EstimateTread[] = new Array(n);
  let chainCableLengthM = 0;
  // Without data outputs no chain has an output to go on (the pixels-total check fails).
  const hasDataOutputs = (profile.dataOutputs ?? 0) > 0;
  // Every data gap on its own: each pixel regenerates the signal (handbook, "Data lines").
  const gaps: DataGap[] = [];
  const leadLimitM = maxDataLeadM(profile);
  const linkLimitM = block.maxDataLinkM ?? DEFAULT_MAX_UNBUFFERED_DATA_M;
  const uniform = byWidth.size === 1;
  const ownCurrentA = (k: number) => pixelCurrentA((treadPieces[k - 1] as PixelPiece).pixels, current.currentPerPixelMa, sizingBrightnessPercent);
  const rowPowerW = round(treadPowerW);
  const rowCurrentA = round(treadCurrentA);
  for (const c of chainBlocks) {
    const chainTreads = c.lastTread - c.firstTread + 1;
    const startFeeds = injectionPoints({ ...injectionInput, lengthM: chainLengthM(c), currentA: chainTreads * treadCurrentA }).injectionPoints + 1;
    const groups = feedGroups(c, treadCurrentA, positions, block, settings, startFeeds, maxFeedCurrentA);
    const lead = sizeRun(block.voltageV, 0, runs.runsM[c.firstTread - 1] as number, settings.cable);
    dataCables.push({ kind: 'chain leads', tread: c.firstTread, cable: lead });
    chains.push({ ...c, pixels: (c.lastTread - c.firstTread + 1) * p, lead, groups });
    for (const g of groups) {
      allGroups.push(g);
      let cumulativeDropV = 0;
      for (let k = g.firstTread; k <= g.lastTread; k++) {
        let cable: RunCable;
        let kind: EstimateTread['cableKind'];
        let lengthM: number;
        let dropPercent = 0;
        if (k === c.firstTread) {
          kind = 'chain-lead';
          cable = lead;
          lengthM = lead.lengthM;
          gaps.push(gap('lead', 'treads', lengthM, leadLimitM, { controller: c.controller, output: hasDataOutputs ? c.output : null, tread: k }));
        } else if (k === g.firstTread) {
          kind = 'data-link';
          lengthM = linkLengthM(positions, k, settings);
          cable = sizeRun(block.voltageV, 0, lengthM, settings.cable);
          dataCables.push({ kind: 'data links', tread: k, cable });
          chainCableLengthM += lengthM;
        } else {
          kind = 'chain-link';
          cable = g.cable as RunCable;
          lengthM = linkLengthM(positions, k, settings);
          cumulativeDropV += loopDropV((g.lastTread - k + 1) * treadCurrentA, lengthM, cable.resistanceOhmPerKm);
          dropPercent = dropPercentOf(cumulativeDropV, block.voltageV);
          chainCableLengthM += lengthM;
        }
        if (k !== c.firstTread) gaps.push(gap('link', 'treads', lengthM, linkLimitM, { controller: c.controller, output: hasDataOutputs ? c.output : null, tread: k }));
        const row: EstimateTread = {
          index: k,
          stripLengthMm: (treadPieces[k - 1] as PixelPiece).lengthMm,
          pixels: (treadPieces[k - 1] as PixelPiece).pixels,
          powerW: uniform ? rowPowerW : round(ownCurrentA(k) * block.voltageV),
          currentA: uniform ? rowCurrentA : round(ownCurrentA(k)),
          controller: c.controller,
          output: hasDataOutputs ? c.output : null,
          cableKind: kind,
          cableLengthM: round(lengthM, 3),
          dropPercent: round(dropPercent, 3),
        };
        setSize(row, settings.cable, cable);
        rows[k - 1] = row;
      }
    }
  }

  let busiestChainPixels = 0;
  for (const c of chains) busiestChainPixels = Math.max(busiestChainPixels, c.pixels);
  const data = pixelData({
    pixels: busiestChainPixels,
    protocol: block.protocol,
    bitsPerPixel: block.bitsPerPixel,
    resetUs: block.resetUs,
    clockHz: block.clockHz,
    currentPerPixelMa: current.currentPerPixelMa,
    supplyVoltageV: block.voltageV,
    brightnessPercent: sizingBrightnessPercent,
  });
  let totalPixels = 0;
  for (const tp of treadPieces) totalPixels += tp.pixels;
  const totalCurrentA = pixelCurrentA(totalPixels, current.currentPerPixelMa, sizingBrightnessPercent);
  const dataOutputs: DataOutputUse[] = (hasDataOutputs ? chains : []).map((c) => ({
    controller: c.controller,
    output: c.output,
    pixels: c.pixels,
    firstTread: c.firstTread,
    lastTread: c.lastTread,
  }));

  trace.push(
    stripFitTrace(widths[narrowest] as number, pitchMm, block.endClearanceMm, fit),
    {
      quantity: 'treads.pixelsPerTread',
      value: p,
      unit: 'pixels',
      formula: block.cutPitchMm === undefined ? 'floor(spaceUm × pixelsPerKm / 10⁹), in integers' : 'whole cut pitches (in µm), then the whole pixels each pitch holds',
      inputs: { stripLengthMm: fit.stripLengthMm, pixelsPerM: block.pixelsPerM, cutPitchMm: block.cutPitchMm ?? null },
      reference: 'arithmetic: whole pixels only',
    },
    pixelCurrentTrace(p, block.currentPerPixelMa, sizingBrightnessPercent, 'tread.currentA', current),
    {
      quantity: 'treads.totalPixels',
      value: totalPixels,
      unit: 'pixels',
      formula: 'treads × pixelsPerTread',
      inputs: { treads: n, pixelsPerTread: p },
      reference: 'arithmetic',
    },
    {
      quantity: 'treadPixels.totalLoadW',
      value: round(totalCurrentA * block.voltageV),
      unit: 'W',
      formula: 'treads × treadCurrentA × voltageV',
      inputs: { treads: n, treadCurrentA: round(treadCurrentA), voltageV: block.voltageV },
      reference: 'P = V·I',
    },
    {
      quantity: 'treads.dataChains',
      value: plan.chainCount,
      unit: 'chains',
      formula: 'ceil(treads / floor(maxPixelsPerOutput / pixelsPerTread)); controllers = max(ceil(chains / dataOutputs), ceil(treads / maxTreads))',
      inputs: {
        maxPixelsPerOutput: profile.maxPixelsPerOutput ?? null,
        dataOutputs: profile.dataOutputs ?? null,
        maxTreads: profile.maxTreads ?? null,
        controllers: plan.controllers,
      },
      reference: 'controller profile; a chain is split only between treads',
    },
    {
      quantity: 'treads.chainCableLengthM',
      value: round(chainCableLengthM, 3),
      unit: 'm',
      formula: 'Σ over links (x(k) − x(k−1) + serviceAllowanceM): each segment wired back and forth, so a link climbs one step',
      inputs: { links: n - chains.length, serviceAllowanceM: settings.cable.serviceAllowanceM },
      reference: 'stair geometry (Pythagoras per step); serpentine wiring (common practice, no published source)',
    },
    {
      quantity: 'treads.feedGroups',
      value: allGroups.length,
      unit: 'feed points',
      formula: 'per chain ceil(chain strip length / maxFeedLengthM), more while a group’s links exceed the drop limit; links sized for Σ L·I (one run with the same current moment)',
      inputs: { chains: chains.length, maxDropPercent: settings.cable.maxDropPercent },
      reference: 'DC distributor theory, loads tapped along a run (any circuits text); IEC 60364-5-52 Annex G loop drop',
    },
  );
  // No pixel on any tread: no data line to judge (strip-fits-tread fails instead).
  const lines = dataLines(p > 0 ? gaps : [], block.protocol, block.voltageV, profile, hasDataOutputs ? chains.length : 0);
  timingTrace('treads', data, trace);
  trace.push(dataLinesTrace('treads', lines, profile, block.maxDataLinkM));
  trace.push(...injectionTrace(injectionInput, injection).map((e) => ({ ...e, quantity: `treads.${e.quantity}` })));
  trace.push(...runsTrace(stair, runs, settings.position, settings.cable.serviceAllowanceGiven));

  return {
    block,
    fit,
    piece,
    current,
    sizingBrightnessPercent,
    uncappedCurrentA: pixelCurrentA(totalPixels, current.currentPerPixelMa, 100),
    pixelsPerTread: p,
    litTreads: litPiecesMm.length,
    litPiecesMm,
    litPieceTreads,
    narrowestWidthMm: widths[narrowest] as number,
    narrowestPixels: (treadPieces[narrowest] as PixelPiece).pixels,
    treadCurrentA,
    totalPixels,
    totalCurrentA,
    totalLoadW: totalCurrentA * block.voltageV,
    treadsPerChainLimit: plan.treadsPerChainLimit,
    chains,
    controllers: plan.controllers,
    controllerBlocks,
    runs,
    data,
    busiestChainPixels,
    dataOutputs,
    dataCables,
    feedGroups: allGroups,
    chainCableLengthM,
    injection,
    maxFeedCurrentA,
    rows,
    dataLines: lines,
  };
}
