import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { controllerProfileSchema } from '../../shared/schemas/controller.js';
import { reelsRequestSchema, reelsResponseSchema } from '../../shared/schemas/reels.js';
import { planReels } from '../../shared/sizing/reels.js';

describe('schemas', () => {
  it('the reels request example gives the reels response example', () => {
    // Alder Row (demo scenario): 14 × 850 mm; 5 per 5 m reel → 3 reels, 3 100 mm left (hand arithmetic)
    const result = planReels(reelsRequestSchema.parse(reelsRequestSchema.meta()?.example));
    const example = reelsResponseSchema.meta()?.example as Record<string, unknown>;
    expect(result.plan).toEqual(example.plan);
    expect(result.reels).toBe(3);
    expect(result.totalWasteMm).toBe(3100);
    expect(reelsResponseSchema.safeParse(example).success).toBe(true);
  });

  it('controller profile example parses, and a reversed tread range is refused at maxTreads', () => {
    expect(controllerProfileSchema.safeParse(controllerProfileSchema.meta()?.example).success).toBe(true);
    const bad = controllerProfileSchema.safeParse({ outputs: 20, maxCurrentPerOutputA: 1.5, minTreads: 10, maxTreads: 4 });
    // minTreads 10 > maxTreads 4 (arithmetic)
    expect(bad.error?.issues.map((i) => i.path.join('.'))).toEqual(['maxTreads']);
  });

  it('parsing never throws, whatever arrives', () => {
    fc.assert(
      fc.property(fc.anything(), (body) => {
        // safeParse reports problems as data; the API turns them into 400s
        expect(() => controllerProfileSchema.safeParse(body)).not.toThrow();
        expect(() => reelsRequestSchema.safeParse(body)).not.toThrow();
      }),
    );
  });
});
