import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { reelsRequestSchema, reelsResponseSchema } from '../../shared/schemas/reels.js';
import { cutReels, planReels } from '../../shared/sizing/reels.js';

const REEL = 5000;
const pieces = (max: number) => fc.array(fc.integer({ min: 50, max: REEL }), { minLength: 1, maxLength: max });

/** The true optimum by trying every assignment; only for a handful of pieces. */
function bruteForceReels(sizes: number[], capacity: number): number {
  let best = sizes.length;
  const free: number[] = [];
  const go = (i: number) => {
    if (free.length >= best) return;
    if (i === sizes.length) {
      best = free.length;
      return;
    }
    const s = sizes[i] as number;
    for (let b = 0; b < free.length; b++) {
      if ((free[b] as number) >= s) {
        free[b] = (free[b] as number) - s;
        go(i + 1);
        free[b] = (free[b] as number) + s;
      }
    }
    free.push(capacity - s);
    go(i + 1);
    free.pop();
  };
  go(0);
  return best;
}

describe('reel plan', () => {
  it('holds every piece exactly once and no reel is over-full', () => {
    fc.assert(
      fc.property(pieces(30), (list) => {
        const plan = cutReels(list, REEL);
        const seen = plan.plan.flatMap((r) => r.pieceIndexes).sort((a, b) => a - b);
        // invariant: a partition of the input pieces
        expect(seen).toEqual(list.map((_, i) => i));
        for (const reel of plan.plan) {
          expect(reel.piecesMm.reduce((s, p) => s + p, 0)).toBeLessThanOrEqual(REEL);
          reel.pieceIndexes.forEach((index, k) => expect(reel.piecesMm[k]).toBe(list[index]));
          // waste = reel − pieces (arithmetic)
          expect(reel.wasteMm).toBe(REEL - reel.piecesMm.reduce((s, p) => s + p, 0));
        }
        expect(plan.totalWasteMm).toBe(plan.reels * REEL - list.reduce((s, p) => s + p, 0));
      }),
    );
  });

  it('first-fit decreasing never beats the lower bound, and exact search never loses to it', () => {
    fc.assert(
      fc.property(pieces(12), (list) => {
        const ffd = cutReels(list, REEL, undefined, 'first-fit-decreasing');
        const best = cutReels(list, REEL);
        // volume bound: ceil(Σ / reel) reels at least
        expect(ffd.reels).toBeGreaterThanOrEqual(Math.ceil(list.reduce((s, p) => s + p, 0) / REEL));
        expect(best.reels).toBeLessThanOrEqual(ffd.reels);
        expect(best.reels).toBeGreaterThanOrEqual(best.lowerBoundReels);
        expect(best.provenOptimal).toBe(true);
      }),
    );
  });

  it('exact search finds the true optimum (brute force)', () => {
    // Pieces of a fifth to seven tenths of a reel are where first-fit decreasing goes wrong.
    const awkward = fc.array(fc.integer({ min: 10, max: 35 }).map((x) => x * 100), { minLength: 1, maxLength: 9 });
    fc.assert(
      fc.property(awkward, (list) => {
        // brute force over every assignment of pieces to reels
        expect(cutReels(list, REEL).reels).toBe(bruteForceReels(list, REEL));
      }),
      { numRuns: 300 },
    );
  });

  it('equal pieces: the closed form matches first-fit decreasing', () => {
    fc.assert(
      fc.property(fc.integer({ min: 50, max: REEL }), fc.integer({ min: 1, max: 60 }), (piece, count) => {
        const list = Array.from({ length: count }, () => piece);
        // floor(reel / piece) per reel; FFD fills reels the same way for equal pieces
        expect(cutReels(list, REEL).reels).toBe(cutReels(list, REEL, undefined, 'first-fit-decreasing').reels);
        expect(cutReels(list, REEL).reels).toBe(Math.ceil(count / Math.floor(REEL / piece)));
      }),
    );
  });

  it('knows a case where the volume bound is not reachable', () => {
    // three 3 000 mm pieces: Σ 9 000 → bound 2 reels, yet no reel holds two (arithmetic)
    const plan = cutReels([3000, 3000, 3000, 100], REEL);
    expect(plan.lowerBoundReels).toBe(2);
    expect(plan.reels).toBe(3);
    expect(plan.provenOptimal).toBe(true);
  });

  it('beats first-fit decreasing where it is known to lose', () => {
    // hand arithmetic, in tenths of a reel: FFD packs [5,4,4,3,2,2] as [5,4] [4,3,2] [2] = 3 reels;
    // [5,3,2] [4,4,2] fills 2 reels exactly
    const list = [5, 4, 4, 3, 2, 2].map((x) => x * 500);
    expect(cutReels(list, REEL, undefined, 'first-fit-decreasing').reels).toBe(3);
    expect(cutReels(list, REEL).reels).toBe(2);
  });

  it('shortens pieces to the whole cut pitches that fit their measured length (issue 8, item 12)', () => {
    const result = planReels(reelsRequestSchema.parse({ piecesMm: [860, 850], cutPitchMm: 50 }));
    // domain rule "rounded down to a whole number of cut pitches": 860 mm → 17 × 50 = 850 mm
    // (it was rounded up to 900 mm, 40 mm past the space measured); 850 stays
    expect(result.plan[0]?.piecesMm).toEqual([850, 850]);
    expect(result.plan.flatMap((r) => r.piecesMm).every((p, i) => p <= [860, 850][i]!)).toBe(true);
    expect(result.warnings.map((w) => w.code)).toContain('pieces_rounded_down');
  });

  it('a piece shorter than one cut pitch is a 400 at its own path', () => {
    const parsed = reelsRequestSchema.safeParse({ piecesMm: [850, 40], cutPitchMm: 50 });
    // arithmetic: 40 mm < one 50 mm pitch → no whole pitch fits
    expect(parsed.error?.issues.map((i) => i.path.join('.'))).toEqual(['piecesMm.1']);
  });

  it('rejects a piece longer than a reel at its own path', () => {
    const parsed = reelsRequestSchema.safeParse({ piecesMm: [850, 5200, 900] });
    expect(parsed.success).toBe(false);
    // default reel 5 000 mm (domain default) < 5 200 mm
    expect(parsed.error?.issues.map((i) => i.path.join('.'))).toEqual(['piecesMm.1']);
    // 4 990 mm is cut at 4 950 mm at a 50 mm pitch: fits a 5 000 mm reel (arithmetic)
    expect(reelsRequestSchema.safeParse({ piecesMm: [4990], cutPitchMm: 50 }).success).toBe(true);
    // arithmetic: at a 300 mm pitch 4 990 mm is cut at 16 × 300 = 4 800 mm, which the reel's 16 × 300 = 4 800 mm holds
    // (rounding up gave 5 100 mm and a 400; issue 8 stopped pieces growing past their space)
    expect(reelsRequestSchema.safeParse({ piecesMm: [4990], cutPitchMm: 300 }).success).toBe(true);
  });

  it('no request the schema accepts throws, and every response matches its schema', () => {
    // Pieces up to the reel length, so most requests pass the schema and reach the engine.
    const request = fc.double({ min: 100, max: 1_000_000, noNaN: true }).chain((reel) =>
      fc.record(
        {
          piecesMm: fc.array(fc.double({ min: 1, max: reel, noNaN: true }), { minLength: 1, maxLength: 40 }),
          reelLengthMm: fc.constant(reel),
          cutPitchMm: fc.double({ min: 1, max: 1000, noNaN: true }),
        },
        { requiredKeys: ['piecesMm'] },
      ),
    );
    let planned = 0;
    fc.assert(
      fc.property(request, (body) => {
        const parsed = reelsRequestSchema.safeParse(body);
        if (!parsed.success) return;
        planned++;
        const result = planReels(parsed.data);
        expect(reelsResponseSchema.safeParse(result).success).toBe(true);
        expect(result.plan.flatMap((r) => r.pieceIndexes)).toHaveLength(body.piecesMm.length);
      }),
    );
    expect(planned).toBeGreaterThan(0);
  });
});
