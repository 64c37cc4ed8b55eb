import type { DriverGroup, DriverInput, DriverResult } from '../schemas/driver.js';
import { splitIntoCircuits } from './driver-mix.js';
import { SizingInputError } from '../tables/errors.js';
import { round, settingEntry, type TraceEntry, type Warning } from './trace.js';
import { ENGINE_VERSION } from './version.js';

/** A common driver series; used when the request names none. */
export const DEFAULT_DRIVER_RATINGS_W: readonly number[] = [30, 60, 100, 150, 200, 240, 320, 480];
export const DEFAULT_MAX_LOADING_PERCENT = 80;
export const DEFAULT_MAINS_VOLTAGE_V = 230;
export const DEFAULT_POWER_FACTOR = 0.9;
/** A CV driver's overload limit, % of rated current: datasheets commonly give 105–150 % (from memory); the upper figure is the safe one for cables. */
export const DEFAULT_CURRENT_LIMIT_PERCENT = 150;

const LOADING_REFERENCE =
  'common practice, no published source (80 % loading); closest published rule NEC 210.19(A)(1) / 215.2(A)(1): 125 % of a continuous load';
const CLASS2_REFERENCE =
  'NEC Chapter 9 Table 11(B), DC not inherently limited, by the maximum output voltage: over 20–60 V 100 VA; 0–20 V 5.0 × Vmax VA and 5 A (from memory); UL 1310';
const SELV_REFERENCE = 'IEC 60598-1 8.2.3 (exposed live parts of Class III luminaires ≤ 60 V ripple-free DC); IEC 61140 / IEC 60364-4-41 (SELV ≤ 120 V ripple-free DC)';

/** Prices for the catalog case: aligned with availableRatingsW, or keyed by rating. */
export type DriverPrices = readonly number[] | ReadonlyMap<number, number>;

export type DriverSelectionInput = DriverInput & { prices?: DriverPrices | undefined };

/**
 * Largest Class 2 supply, VA, by its maximum output voltage (Vmax, not the nominal): up to 20 V
 * 5 × Vmax VA (with 5 A); over 20 to 60 V 100 VA. null above 60 V, where Class 2 does not exist.
 */
export function class2MaxVA(maxOutputVoltageV: number): number | null {
  if (maxOutputVoltageV <= 20) return 5 * maxOutputVoltageV;
  if (maxOutputVoltageV <= 60) return 100;
  return null;
}

/** Class 2 current limit up to 20 V: 5 A (NEC Chapter 9 Table 11(B), from memory); none above. */
export function class2MaxCurrentA(maxOutputVoltageV: number): number | null {
  return maxOutputVoltageV <= 20 ? 5 : null;
}

/** Largest Class 2 load in W at the nominal voltage: the VA limit by Vmax, and up to 20 V the 5 A limit too. */
export function class2CapW(outputVoltageV: number, maxOutputVoltageV = outputVoltageV): number | null {
  const va = class2MaxVA(maxOutputVoltageV);
  if (va === null) return null;
  const amps = class2MaxCurrentA(maxOutputVoltageV);
  return amps === null ? va : Math.min(va, amps * outputVoltageV);
}

export const CIRCUIT_REFERENCE =
  'one supply per circuit: constant-voltage drivers are not paralleled unless their datasheet allows it (common practice, no published source); Class 2 supplies shall not be paralleled or interconnected unless listed for it (NEC 725.121(B) 2017/2020, 725.60(B) 2023, from memory)';

/** Rating the drivers must add up to: load / (maxLoadingPercent / 100). */
export function requiredRatingW(loadW: number, maxLoadingPercent = DEFAULT_MAX_LOADING_PERCENT): number {
  // Multiply first: 216 × 100 / 80 is exactly 270, 216 / 0.8 is not.
  return (loadW * 100) / maxLoadingPercent;
}

function alignPrices(ratingsW: readonly number[], prices: DriverPrices | undefined): number[] | undefined {
  if (prices === undefined) return undefined;
  const aligned =
    'get' in prices
      ? ratingsW.map((r) => {
          const price = prices.get(r);
          if (price === undefined) throw new SizingInputError(['prices'], `No price for the ${r} W rating`, 'driver_price_missing');
          return price;
        })
      : [...prices];
  if (aligned.length !== ratingsW.length) {
    throw new SizingInputError(['prices'], `${aligned.length} prices for ${ratingsW.length} ratings`, 'driver_price_missing');
  }
  if (aligned.some((p) => !Number.isFinite(p) || p < 0)) {
    throw new SizingInputError(['prices'], 'Prices must be finite and not negative', 'driver_price_invalid');
  }
  return aligned;
}

export function chooseDrivers(input: DriverSelectionInput): DriverResult {
  const maxLoadingPercent = input.maxLoadingPercent ?? DEFAULT_MAX_LOADING_PERCENT;
  const ratingsW = input.availableRatingsW ?? DEFAULT_DRIVER_RATINGS_W;
  // The schema rules these out; callers that skip it (the estimate's catalog) get a field error, not an endless search.
  if (!(maxLoadingPercent > 0 && maxLoadingPercent <= 100)) {
    throw new SizingInputError(['maxLoadingPercent'], 'maxLoadingPercent must be above 0 and at most 100', 'invalid_loading');
  }
  if (ratingsW.some((r) => !(Number.isFinite(r) && r > 0))) {
    throw new SizingInputError(['availableRatingsW'], 'Driver ratings must be finite and above 0 W', 'invalid_driver_rating');
  }
  const prices = alignPrices(ratingsW, input.prices);
  const requiredW = requiredRatingW(input.loadW, maxLoadingPercent);
  const warnings: Warning[] = [];

  // Cap on one supply: Class 2 by voltage, and/or an explicit VA cap (VA = W on the DC side).
  const vmax = input.maxOutputVoltageV ?? input.outputVoltageV;
  const class2Cap = input.class2 ? class2CapW(input.outputVoltageV, vmax) : null;
  if (input.class2 && class2Cap === null) {
    warnings.push({
      code: 'class2_not_available',
      message: `Class 2 supplies stop at 60 V DC (30 V in wet locations); a ${vmax} V maximum output cannot be Class 2, so no Class 2 cap was applied.`,
    });
  }
  const caps = [class2Cap, input.maxSupplyVA ?? null].filter((c): c is number => c !== null);
  const maxSupplyW = caps.length > 0 ? Math.min(...caps) : null;
  const usableRatings: number[] = [];
  const usablePrices: number[] = [];
  const unusableRatingsW: number[] = [];
  ratingsW.forEach((r, i) => {
    if (maxSupplyW !== null && r > maxSupplyW * (1 + 1e-9)) {
      unusableRatingsW.push(r);
    } else {
      usableRatings.push(r);
      if (prices) usablePrices.push(prices[i]!);
    }
  });

  const split = splitIntoCircuits(requiredW, usableRatings, prices ? usablePrices : undefined);
  const drivers: DriverGroup[] = [];
  const circuitLoadW = split ? input.loadW / split.circuits : null;
  const loadingPercent = split ? (circuitLoadW! / split.driver.ratingW) * 100 : null;
  if (split) {
    drivers.push({
      ratingW: split.driver.ratingW,
      count: split.circuits,
      loadW: round(circuitLoadW!, 4),
      loadingPercent: round(loadingPercent!, 4),
    });
    if (split.circuits > 1) {
      warnings.push({
        code: 'load_split_into_circuits',
        message: `No single ${round(requiredW, 1)} W supply is available${maxSupplyW !== null ? ` within the ${maxSupplyW} W cap` : ''}: wire the load as ${split.circuits} separate circuits of at most ${round(circuitLoadW!, 1)} W, each on its own ${split.driver.ratingW} W driver. Never parallel the drivers' outputs${input.class2 ? ' or join the 0 V of Class 2 supplies' : ''}.`,
      });
    }
  } else {
    warnings.push({
      code: 'no_usable_driver_rating',
      message: `No available rating is at or below the ${maxSupplyW} W cap per supply: add smaller ratings or lift the cap.`,
    });
  }

  if (maxLoadingPercent > DEFAULT_MAX_LOADING_PERCENT) {
    warnings.push({
      code: 'loading_above_practice',
      message: `Drivers loaded up to ${maxLoadingPercent} %: common practice is at most ${DEFAULT_MAX_LOADING_PERCENT} %, more runs them hot and shortens their life.`,
    });
  }
  if (input.outputVoltageV > 120) {
    warnings.push({ code: 'not_selv', message: `${input.outputVoltageV} V DC is above the 120 V SELV limit (IEC 61140): this is not extra-low-voltage wiring.` });
  } else if (input.outputVoltageV > 60) {
    warnings.push({
      code: 'selv_exposed_parts',
      message: `${input.outputVoltageV} V DC is above 60 V: exposed live parts of a Class III luminaire are not allowed (IEC 60598-1 8.2.3); enclose the strip and its joints.`,
    });
  }

  const trace: TraceEntry[] = [
    settingEntry('maxLoadingPercent', maxLoadingPercent, '%', input.maxLoadingPercent !== undefined, LOADING_REFERENCE),
    {
      quantity: 'requiredRatingW',
      value: round(requiredW, 4),
      unit: 'W',
      formula: 'P_load / (maxLoadingPercent / 100)',
      inputs: { loadW: input.loadW, maxLoadingPercent },
      reference: LOADING_REFERENCE,
    },
    {
      quantity: 'maxSupplyW',
      value: maxSupplyW ?? 'uncapped',
      unit: 'W',
      formula: 'min(Class 2 limit at the output voltage, maxSupplyVA)',
      inputs: {
        outputVoltageV: input.outputVoltageV,
        class2: input.class2 ?? false,
        maxOutputVoltageV: vmax,
        maxOutputVoltageDefaulted: input.maxOutputVoltageV === undefined,
        class2LimitVA: class2Cap,
        maxSupplyVA: input.maxSupplyVA ?? null,
        unusableRatingsW: unusableRatingsW.join(', '),
      },
      reference: input.class2 ? CLASS2_REFERENCE : 'request',
    },
    {
      quantity: 'circuits',
      value: split ? split.circuits : 0,
      unit: 'circuits',
      formula: 'ceil(requiredRatingW / largest usable rating): the fewest separate circuits, the load split evenly over them',
      inputs: {
        requiredRatingW: round(requiredW, 4),
        largestUsableRatingW: usableRatings.length > 0 ? Math.max(...usableRatings) : null,
      },
      reference: CIRCUIT_REFERENCE,
    },
    {
      quantity: 'drivers',
      value: split ? `${split.circuits} × ${split.driver.ratingW} W, one per circuit` : 'none',
      unit: '',
      formula: 'per circuit the ' + (prices ? 'cheapest' : 'smallest') + ' single rating ≥ requiredRatingW / circuits; drivers are never paralleled',
      inputs: {
        requiredPerCircuitW: split ? round(split.requiredPerCircuitW, 4) : null,
        availableRatingsW: ratingsW.join(', '),
        availableRatingsDefault: input.availableRatingsW === undefined,
        totalPrice: split && split.driver.price !== null ? round(split.driver.price * split.circuits, 2) : null,
      },
      reference: CIRCUIT_REFERENCE,
    },
    {
      quantity: 'totalRatingW',
      value: split ? split.circuits * split.driver.ratingW : 0,
      unit: 'W',
      formula: 'circuits × ratingW',
      inputs: { driverCount: split ? split.circuits : 0 },
      reference: 'arithmetic',
    },
    {
      quantity: 'loadingPercent',
      value: loadingPercent === null ? 'none' : round(loadingPercent, 4),
      unit: '%',
      formula: 'P_circuit / ratingW · 100, P_circuit = P_load / circuits',
      inputs: { loadW: input.loadW, circuitLoadW: circuitLoadW === null ? null : round(circuitLoadW, 4), ratingW: split ? split.driver.ratingW : null },
      reference: LOADING_REFERENCE,
    },
    {
      quantity: 'selv',
      value: input.outputVoltageV <= 60 ? 'within 60 V DC' : input.outputVoltageV <= 120 ? 'SELV, live parts must be enclosed' : 'not SELV',
      unit: '',
      formula: 'V_out ≤ 60 V DC (exposed live parts); V_out ≤ 120 V DC (SELV)',
      inputs: { outputVoltageV: input.outputVoltageV },
      reference: SELV_REFERENCE,
    },
  ];

  const result: DriverResult = {
    requiredRatingW: round(requiredW, 4),
    maxLoadingPercent,
    drivers,
    driverCount: split ? split.circuits : 0,
    circuits: split ? split.circuits : 0,
    circuitLoadW: circuitLoadW === null ? null : round(circuitLoadW, 4),
    totalRatingW: split ? split.circuits * split.driver.ratingW : 0,
    loadingPercent: loadingPercent === null ? null : round(loadingPercent, 4),
    maxSupplyW,
    unusableRatingsW,
    warnings,
    engineVersion: ENGINE_VERSION,
    trace,
  };
  if (split && split.driver.price !== null) result.totalPrice = round(split.driver.price * split.circuits, 2);

  if (input.efficiencyPercent !== undefined) {
    const mainsVoltageV = input.mainsVoltageV ?? DEFAULT_MAINS_VOLTAGE_V;
    const powerFactor = input.powerFactor ?? DEFAULT_POWER_FACTOR;
    const inputPowerW = input.loadW / (input.efficiencyPercent / 100);
    const mainsCurrentA = inputPowerW / (mainsVoltageV * powerFactor);
    result.inputPowerW = round(inputPowerW, 4);
    result.mainsCurrentA = round(mainsCurrentA, 4);
    trace.push(
      {
        quantity: 'inputPowerW',
        value: result.inputPowerW,
        unit: 'W',
        formula: 'P_in = P_load / efficiency',
        inputs: { loadW: input.loadW, efficiencyPercent: input.efficiencyPercent },
        reference: 'definition of efficiency',
      },
      {
        quantity: 'mainsCurrentA',
        value: result.mainsCurrentA,
        unit: 'A',
        formula: 'I = P_in / (V_mains · PF)',
        inputs: {
          inputPowerW: result.inputPowerW,
          mainsVoltageV,
          mainsVoltageDefault: input.mainsVoltageV === undefined,
          powerFactor,
          powerFactorDefault: input.powerFactor === undefined,
        },
        reference:
          input.powerFactor === undefined
            ? 'definition of power factor; PF 0.9 is an assumed default, no published source — use the driver datasheet'
            : 'definition of power factor',
      },
    );
  }
  return result;
}
