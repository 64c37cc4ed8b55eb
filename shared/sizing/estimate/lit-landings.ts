import { stepLengthM, treadPositionsM, type StairGeometry } from '../geometry.js';
import type { OutputAllocation } from '../outputs.js';

/**
 * Lit landings (issue 8, "treads that differ"): a strip along a landing's front edge lights in
 * the step sequence between the flights, on a CV output of its own. The controller's outputs
 * are allocated over the sequence foot first — treads and lit landings — and the allocation is
 * then told back in tread numbers, with each output's landings beside its treads.
 */
export interface LitLanding {
  /** Landing number: 1 = the landing above flight 1. */
  landing: number;
  /** The tread just below the landing (last tread of its flight). */
  belowTread: number;
  /** Position along the cable route, m: the landing's front edge, one step above that tread. */
  positionM: number;
}

/** One position of the lighting sequence: a tread, or a lit landing. */
export type SequenceItem = { tread: number; landing?: undefined } | { tread?: undefined; landing: LitLanding };

export function litLandingsOf(stair: StairGeometry, litLandings: readonly number[] | undefined): LitLanding[] {
  if (!litLandings || litLandings.length === 0 || !stair.flights || stair.flights.length < 2) return [];
  const x = treadPositionsM(stair);
  const step = stepLengthM(stair.riserHeightMm, stair.goingMm);
  const out: LitLanding[] = [];
  let last = 0;
  stair.flights.forEach((flight, i) => {
    last += flight.treads;
    if (i < stair.flights!.length - 1 && litLandings.includes(i + 1)) {
      out.push({ landing: i + 1, belowTread: last, positionM: (x[last - 1] as number) + step });
    }
  });
  return out;
}

/** Treads and lit landings in lighting order, foot first. */
export function lightingSequence(treads: number, landings: readonly LitLanding[]): SequenceItem[] {
  const seq: SequenceItem[] = [];
  let l = 0;
  for (let t = 1; t <= treads; t++) {
    seq.push({ tread: t });
    while (l < landings.length && (landings[l] as LitLanding).belowTread === t) seq.push({ landing: landings[l++] as LitLanding });
  }
  return seq;
}

/**
 * Tells an allocation made over the sequence back in tread numbers: outputs list their treads
 * (and landings), controller blocks their first and last treads. A block holding only a landing
 * (one output per controller) keeps the tread below it, so every block names a tread.
 */
export function allocationInTreads(allocation: OutputAllocation, seq: readonly SequenceItem[]): void {
  for (const o of allocation.outputs) {
    const items = o.treads.map((s) => seq[s - 1] as SequenceItem);
    o.treads = items.filter((i) => i.tread !== undefined).map((i) => i.tread as number);
    const landings = items.filter((i) => i.landing !== undefined).map((i) => (i.landing as LitLanding).landing);
    if (landings.length > 0) o.landings = landings;
  }
  for (const c of allocation.controllers) {
    const items = seq.slice(c.firstTread - 1, c.lastTread);
    const treads = items.filter((i) => i.tread !== undefined).map((i) => i.tread as number);
    const fallback = (items[0]?.landing as LitLanding | undefined)?.belowTread ?? 1;
    c.firstTread = treads[0] ?? fallback;
    c.lastTread = treads[treads.length - 1] ?? fallback;
    c.treads = treads.length;
  }
}
