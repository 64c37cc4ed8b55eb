import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { sensorPlan, sensorTrace } from '../../shared/sizing/sensors.js';

// HL-M05 sensor and HL-K20 input (demo scenario): 5 V PNP 8 mA; PNP inputs at 5 V / 12 mA.
const hlM05 = { outputType: 'pnp', supplyV: 5, currentMa: 8 } as const;
const hlK20Input = { type: 'pnp', supplyV: 5, maxCurrentMa: 12 } as const;

describe('sensor plan', () => {
  it('a straight flight gets a sensor at the foot and the head', () => {
    const plan = sensorPlan({ flights: [{ treads: 14 }], motion: hlM05, sensorInput: hlK20Input });
    // common practice, no published source: foot and head of every flight
    expect(plan.placements).toEqual([
      { role: 'foot', flight: 1, tread: 1 },
      { role: 'head', flight: 1, tread: 14 },
    ]);
    // HL-K20 profile: 8 mA ≤ 12 mA, PNP = PNP
    expect(plan.currentOk).toBe(true);
    expect(plan.needsInterface).toBe(false);
  });

  it('counts two for the whole stair plus every landing where people enter', () => {
    fc.assert(
      fc.property(fc.array(fc.record({ treads: fc.integer({ min: 1, max: 20 }), joinedLandingAbove: fc.boolean() }), { minLength: 1, maxLength: 5 }), (flights) => {
        const joined = flights.slice(0, -1).filter((f) => f.joinedLandingAbove).length;
        // team handbook, rules of thumb (common practice, no published source): foot and head of the
        // whole stair — an L or U stair with a plain landing still has two — + 1 per entered landing.
        // (Issue 8 changed this from two per flight.)
        const plan = sensorPlan({ flights });
        expect(plan.motionSensors).toBe(2 + joined);
        expect(plan.placements.filter((p) => p.role === 'foot' || p.role === 'head')).toHaveLength(2);
      }),
    );
  });

  it('a U stair of three flights: foot of flight 1, head of flight 3', () => {
    // common practice, no published source: one sensor at the foot and one at the head of the whole stair
    expect(sensorPlan({ flights: [{ treads: 5 }, { treads: 4 }, { treads: 6 }] }).placements).toEqual([
      { role: 'foot', flight: 1, tread: 1 },
      { role: 'head', flight: 3, tread: 15 },
    ]);
  });

  it('an NPN sensor on a PNP input needs an interface', () => {
    // PNP sources, NPN sinks (three-wire DC sensor outputs, IEC 60947-5-2): they do not interchange
    const plan = sensorPlan({ flights: [{ treads: 14 }], motion: { ...hlM05, outputType: 'npn' }, sensorInput: hlK20Input });
    expect(plan.needsInterface).toBe(true);
    expect(plan.warnings.map((w) => w.code)).toContain('sensor_type_mismatch');
  });

  it('checks sensor current against about 10 mA when the profile gives none', () => {
    // common practice, no published source: ≈ 10 mA per sensor input
    expect(sensorPlan({ flights: [{ treads: 14 }], motion: { ...hlM05, currentMa: 15 } }).currentOk).toBe(false);
    expect(sensorPlan({ flights: [{ treads: 14 }], motion: hlM05 }).currentLimitMa).toBe(10);
  });

  it('defaults the daylight cut-off below a lit hallway and explains why', () => {
    const input = { corridor: {} };
    const plan = sensorPlan(input);
    // common practice, no published source: 50 lx, under a lit hallway (~80 lx) and EN 12464-1 corridors 100 lx
    expect(plan.daylightCutoffLux).toBe(50);
    expect(plan.daylightCutoffLux).toBeLessThan(100);
    // Quayside Studio corridor (demo scenario): one sensor at each end
    expect(plan.motionSensors).toBe(2);
    const entry = sensorTrace(input, plan).find((t) => t.quantity === 'daylightCutoffLux');
    expect(entry?.reference).toMatch(/EN 12464-1/);
  });
});
