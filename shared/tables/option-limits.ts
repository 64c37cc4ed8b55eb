/**
 * Bounds of the kit-options search (POST /v1/estimates/options). Each candidate is one full
 * estimate (about 2 ms for a 14-tread stair on one core), so the cap keeps one call well under a
 * second for the stairs shops sell kits for; the cost budget charges every candidate run.
 */

/** Most candidates one call runs: a shop's range of 6 strips × 3 controllers × 3 × 3 positions is 162 (common practice, no published source). */
export const MAX_OPTION_CANDIDATES = 200;
/** Most designs one answer lists; 3 unless the request asks for another number. */
export const MAX_OPTION_DESIGNS = 10;
export const DEFAULT_OPTION_DESIGNS = 3;
/** Most SKUs a constraint may list (strips or controllers): more than a stair-lighting range holds. */
export const MAX_OPTION_SKUS = 50;
/** Most strip voltages a constraint may list: CV strip comes at a handful (5, 12, 24, 36, 48 V). */
export const MAX_OPTION_VOLTAGES = 8;
