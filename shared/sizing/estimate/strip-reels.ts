import type { z } from 'zod';
import type { estimateReelsResultSchema } from '../../schemas/estimate.js';
import { cutReels, DEFAULT_REEL_LENGTH_MM, reelsTrace, usableReelMm, type ReelPlan } from '../reels.js';
import { round, type TraceEntry } from '../trace.js';
import type { StripLine, Wanted } from './bom.js';
import { findPixelStrip, findStrip, type CatalogIndex } from './catalog.js';
import type { RailPart } from './rail-pixels.js';
import { reelLengthDefault, type Settings } from './settings.js';
import type { TreadPixelPart } from './tread-pixels.js';
import type { TreadStripPart } from './tread-strips.js';

type ReelsResult = z.output<typeof estimateReelsResultSchema>;

export interface TreadReels {
  plan: ReelPlan;
  reelLengthMm: number;
  /** Reels for pieces longer than a reel, joined from whole reels. */
  jointReels: number;
  response: NonNullable<ReelsResult['treads']>;
}

export interface RailReels {
  reels: number;
  reelLengthMm: number;
  response: NonNullable<ReelsResult['rail']>;
}

/** The request's reel length wins, then the catalog item's, then 5 m. */
export function reelLength(requested: number | undefined, catalogReelMm: number | undefined, trace: TraceEntry[]): number {
  if (requested !== undefined) return requested;
  if (catalogReelMm !== undefined) return catalogReelMm;
  reelLengthDefault(trace);
  return DEFAULT_REEL_LENGTH_MM;
}

function nothingFits(pieces: number): ReelPlan {
  return {
    reels: 0,
    plan: [],
    totalWasteMm: 0,
    lowerBoundReels: 0,
    provenOptimal: true,
    method: 'identical-pieces',
    usableReelLengthMm: 0,
    roundedPieces: 0,
    unplaceableIndexes: Array.from({ length: pieces }, (_, i) => i),
  };
}

/** Tread pieces cut from reels without a joint inside a piece (the reels module's cutting plan). */
export function planTreadReels(
  piecesMm: readonly number[],
  pieceTreads: readonly number[],
  cutPitchMm: number | undefined,
  reelLengthMm: number,
  sku: string | undefined,
  trace: TraceEntry[],
): TreadReels | null {
  if (piecesMm.length === 0) return null;
  // A catalog reel shorter than one cut pitch yields no piece at all; every piece needs joints.
  const cut = usableReelMm(reelLengthMm, cutPitchMm) > 0 ? cutReels(piecesMm, reelLengthMm, cutPitchMm) : nothingFits(piecesMm.length);
  // The plan counts pieces from 0; the response names treads (unlit treads have no piece).
  const treadIndex = (i: number) => (pieceTreads[i] as number) - 1;
  const plan: ReelPlan = {
    ...cut,
    plan: cut.plan.map((r) => ({ ...r, pieceIndexes: r.pieceIndexes.map(treadIndex) })),
    unplaceableIndexes: cut.unplaceableIndexes.map(treadIndex),
  };
  let jointReels = 0;
  for (const i of cut.unplaceableIndexes) jointReels += Math.ceil((piecesMm[i] as number) / reelLengthMm);
  for (const entry of reelsTrace({ piecesMm: [...piecesMm], reelLengthMm, cutPitchMm }, plan)) trace.push({ ...entry, quantity: `treads.${entry.quantity}` });
  const response: TreadReels['response'] = {
    reels: plan.reels + jointReels,
    reelLengthMm,
    plan: plan.plan,
    totalWasteMm: round(plan.totalWasteMm, 3),
    lowerBoundReels: plan.lowerBoundReels,
    provenOptimal: plan.provenOptimal,
    method: plan.method,
    unplaceableTreads: plan.unplaceableIndexes.map((i) => i + 1),
  };
  if (sku !== undefined) response.sku = sku;
  return { plan, reelLengthMm, jointReels, response };
}

/** A rail run is one continuous strip: whole reels joined end to end. */
export function planRailReels(lengthM: number, reelLengthMm: number, sku: string | undefined, trace: TraceEntry[]): RailReels {
  const reels = Math.ceil((lengthM * 1000) / reelLengthMm - 1e-9);
  trace.push({
    quantity: 'rail.reels',
    value: reels,
    unit: 'reels',
    formula: 'ceil(lengthM × 1000 / reelLengthMm); reels joined end to end',
    inputs: { lengthM, reelLengthMm },
    reference: 'arithmetic',
  });
  const response: RailReels['response'] = { reels, reelLengthMm, lengthM, joints: Math.max(0, reels - 1) };
  if (sku !== undefined) response.sku = sku;
  return { reels, reelLengthMm, response };
}

type StockedStrip = { sku: string; unitPrice?: number | undefined; description?: string | undefined; reelLengthMm?: number | undefined; voltageV: number };

/** A strip line of the bill of materials; a catalog item that differs from the request is noted, the request wins. */
function stripLine(
  category: StripLine['category'],
  description: string,
  reels: number,
  reelLengthMm: number,
  requestedSku: string | undefined,
  item: StockedStrip | undefined,
  differs: boolean,
  want: Wanted,
): StripLine {
  return {
    want: requestedSku !== undefined ? { kind: category, fields: { sku: requestedSku } } : want,
    category,
    description,
    reels,
    reelLengthMm,
    sku: requestedSku,
    match: item && { sku: item.sku, unitPrice: item.unitPrice, description: item.description, reelLengthMm: item.reelLengthMm },
    note: item && differs ? `catalog item ${item.sku} differs from the strip described in the request; sized with the request's figures` : undefined,
  };
}

/** Reels for every strip of the layout, and the strip lines of the bill of materials they become. */
export function planReels(
  treadStrips: TreadStripPart | null,
  treadPixels: TreadPixelPart | null,
  rail: RailPart | null,
  settings: Settings,
  catalog: CatalogIndex | null,
  trace: TraceEntry[],
): { treadReels: TreadReels | null; railReels: RailReels | null; strips: StripLine[] } {
  const strips: StripLine[] = [];
  let treadReels: TreadReels | null = null;
  let railReels: RailReels | null = null;
  if (treadStrips) {
    const s = treadStrips.strip;
    const item = catalog ? findStrip(catalog, s.sku, s.voltageV, s.powerWPerM, s.cutPitchMm) : undefined;
    const reelMm = reelLength(settings.reelLengthMm, item?.reelLengthMm, settings.defaultsUsed);
    treadReels = planTreadReels(treadStrips.litPiecesMm, treadStrips.litPieceTreads, s.cutPitchMm, reelMm, item?.sku ?? s.sku, trace);
    if (treadReels) {
      const description = `CV strip ${s.voltageV} V ${s.powerWPerM} W/m, cut pitch ${s.cutPitchMm} mm, ${reelMm / 1000} m reel`;
      const differs = item !== undefined && (item.voltageV !== s.voltageV || item.powerWPerM !== s.powerWPerM);
      strips.push(
        stripLine('strip', description, treadReels.response.reels, reelMm, s.sku, item, differs, {
          kind: 'strip',
          fields: { voltageV: s.voltageV, powerWPerM: s.powerWPerM, cutPitchMm: s.cutPitchMm },
        }),
      );
    }
  }
  if (treadPixels) {
    const b = treadPixels.block;
    const item = catalog ? findPixelStrip(catalog, b.sku, b.voltageV, b.pixelsPerM, b.protocol) : undefined;
    const reelMm = reelLength(settings.reelLengthMm, item?.reelLengthMm, settings.defaultsUsed);
    treadReels = planTreadReels(treadPixels.litPiecesMm, treadPixels.litPieceTreads, b.cutPitchMm, reelMm, item?.sku ?? b.sku, trace);
    if (treadReels) {
      const description = `Pixel strip ${b.voltageV} V ${b.pixelsPerM} pixels/m, ${b.protocol}, ${reelMm / 1000} m reel`;
      const differs = item !== undefined && (item.voltageV !== b.voltageV || item.pixelsPerM !== b.pixelsPerM);
      strips.push(
        stripLine('pixel-strip', description, treadReels.response.reels, reelMm, b.sku, item, differs, {
          kind: 'pixel-strip',
          fields: { voltageV: b.voltageV, pixelsPerM: b.pixelsPerM, protocol: b.protocol },
        }),
      );
    }
  }
  // A rail that holds no whole pixel gets no reel (the rail-holds-pixels check fails instead).
  if (rail && rail.pixels > 0) {
    const r = rail.rail;
    const item = catalog ? findPixelStrip(catalog, r.sku, r.voltageV, r.pixelsPerM, r.protocol) : undefined;
    const reelMm = reelLength(settings.reelLengthMm, item?.reelLengthMm, settings.defaultsUsed);
    railReels = planRailReels(r.lengthM, reelMm, item?.sku ?? r.sku, trace);
    const description = `Pixel strip ${r.voltageV} V ${r.pixelsPerM} pixels/m, ${r.protocol}, ${reelMm / 1000} m reel (rail)`;
    const differs = item !== undefined && (item.voltageV !== r.voltageV || item.pixelsPerM !== r.pixelsPerM);
    strips.push(
      stripLine('pixel-strip', description, railReels.reels, reelMm, r.sku, item, differs, {
        kind: 'pixel-strip',
        fields: { voltageV: r.voltageV, pixelsPerM: r.pixelsPerM, protocol: r.protocol },
      }),
    );
  }
  return { treadReels, railReels, strips };
}
