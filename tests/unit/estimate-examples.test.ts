import { describe, expect, it } from 'vitest';
import type { z } from 'zod';
import { catalogSchema } from '../../shared/schemas/catalog.js';
import {
  railPixelsRequestSchema,
  treadPixelsRequestSchema,
  treadsAndRailRequestSchema,
  treadStripsRequestSchema,
} from '../../shared/schemas/estimate.js';
import * as examples from '../../shared/schemas/estimate-examples.js';

// The examples are plain data (so the schema may import them without a cycle); their types and
// validity are checked here instead, at compile time (`satisfies`) and at run time (parse).
/** The examples are `as const`; the schemas' input types take mutable arrays. */
type Mutable<T> = { -readonly [K in keyof T]: Mutable<T[K]> };
const m = <T>(value: T) => value as Mutable<T>;

const typed = {
  alderRowTownhouse: m(examples.alderRowTownhouse) satisfies z.input<typeof treadStripsRequestSchema>,
  alderRowCornerUnit: m(examples.alderRowCornerUnit) satisfies z.input<typeof treadStripsRequestSchema>,
  harborLaneCheckout: m(examples.harborLaneCheckout) satisfies z.input<typeof treadStripsRequestSchema>,
  quaysideCorridor: m(examples.quaysideCorridor) satisfies z.input<typeof railPixelsRequestSchema>,
  alderRowWithRail: m(examples.alderRowWithRail) satisfies z.input<typeof treadsAndRailRequestSchema>,
  alderRowTreadPixels: m(examples.alderRowTreadPixels) satisfies z.input<typeof treadPixelsRequestSchema>,
  harborLaneCatalog: m(examples.harborLaneCatalog) satisfies z.input<typeof catalogSchema>,
};

describe('the demo examples', () => {
  it('parse with the schema of their layout', () => {
    expect(treadStripsRequestSchema.safeParse(typed.alderRowTownhouse).success).toBe(true);
    expect(treadStripsRequestSchema.safeParse(typed.alderRowCornerUnit).success).toBe(true);
    expect(treadStripsRequestSchema.safeParse(typed.harborLaneCheckout).success).toBe(true);
    expect(railPixelsRequestSchema.safeParse(typed.quaysideCorridor).success).toBe(true);
    expect(treadsAndRailRequestSchema.safeParse(typed.alderRowWithRail).success).toBe(true);
    expect(treadPixelsRequestSchema.safeParse(typed.alderRowTreadPixels).success).toBe(true);
    expect(catalogSchema.safeParse(typed.harborLaneCatalog).success).toBe(true);
  });
});
