/**
 * Overcurrent protection of a low-voltage circuit fed by a constant-voltage driver. A fuse
 * protects its cable when I_B ≤ I_n ≤ I_z; a current-limited driver whose limit is near the
 * fuse rating may never blow it, so the cable must then carry the driver's limit itself.
 */

/** Preferred fuse ratings, A (R10 series of miniature and low-voltage fuses; IEC 60127-2 / IEC 60269, from memory). */
export const FUSE_RATINGS_A: readonly number[] = [1, 1.6, 2, 2.5, 3.15, 4, 5, 6.3, 8, 10, 12.5, 16, 20, 25, 32, 40, 50, 63, 80, 100, 125];

/** A fuse is not loaded above 80 % continuously: I_n ≥ 1.25 × I_B (NEC 210.20(A), the analogous continuous-load rule). */
export const FUSE_MARGIN = 1.25;

/** A miniature fuse opens within 30 min at 2.1 × I_n (IEC 60127-2, from memory): a driver must reach that to blow it. */
export const FUSE_OPENING_FACTOR = 2.1;

export const PROTECTION_REFERENCE =
  'IEC 60364-4-43 433.1: I_B ≤ I_n ≤ I_z (from memory); I_n ≥ 1.25 × I_B as NEC 210.20(A) asks for continuous loads; a fuse opens at about 2.1 × I_n (IEC 60127-2, from memory), so a driver limited below that never blows it and the cable must carry the driver’s limit';

export interface ProtectionPlan {
  /** Fuse at the driver for this feeder, A; null when no preferred rating fits between 1.25 × I_B and I_z. */
  fuseA: number | null;
  /** The driver's current limit is within the thinnest cable's rating: the driver itself protects it. */
  driverProtects: boolean;
  /** The fuse fits and the driver can deliver enough current to open it. */
  fuseProtects: boolean;
  protectedBy: 'driver current limit' | 'fuse' | 'none';
}

/** The smallest preferred fuse at or above 1.25 × I_B that does not exceed I_z; null when none fits. */
export function fuseFor(loadCurrentA: number, cableRatingA: number): number | null {
  const floor = loadCurrentA * FUSE_MARGIN;
  for (const a of FUSE_RATINGS_A) {
    if (a < floor * (1 - 1e-9)) continue;
    return a <= cableRatingA * (1 + 1e-9) ? a : null;
  }
  return null;
}

/**
 * How the thinnest cable of a feeder is protected, given the load current, that cable's rating
 * and the driver's current limit (all A).
 */
export function protectionFor(loadCurrentA: number, thinnestRatingA: number, driverLimitA: number | null): ProtectionPlan {
  const fuseA = fuseFor(loadCurrentA, thinnestRatingA);
  const driverProtects = driverLimitA !== null && driverLimitA <= thinnestRatingA * (1 + 1e-9);
  // Without a known driver the fuse is taken to open (an unlimited supply).
  const fuseProtects = fuseA !== null && (driverLimitA === null || driverLimitA >= FUSE_OPENING_FACTOR * fuseA * (1 - 1e-9));
  return { fuseA, driverProtects, fuseProtects, protectedBy: driverProtects ? 'driver current limit' : fuseProtects ? 'fuse' : 'none' };
}
