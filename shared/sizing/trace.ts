/**
 * Every headline number the engine returns can explain itself: a trace entry names the
 * quantity, its value and unit, the formula, the inputs used and the published source
 * (or `common practice, no published source`).
 */
export interface TraceEntry {
  quantity: string;
  value: number | string | boolean;
  unit: string;
  formula: string;
  inputs: Record<string, number | string | boolean | null>;
  reference: string;
}

/** A limit reached or a default assumed, reported by the calculation endpoints. */
export interface Warning {
  code: string;
  message: string;
}

/** Rounds for presentation without float noise (1.0400000000000003 → 1.04). */
export function round(value: number, decimals = 4): number {
  const f = 10 ** decimals;
  return Math.round((value + Number.EPSILON * Math.sign(value)) * f) / f;
}

/**
 * The trace entry of a setting the caller may give or leave to its default, so every response
 * says which defaults it used.
 */
export function settingEntry(
  quantity: string,
  value: number | string | boolean,
  unit: string,
  given: boolean,
  reference: string,
  defaultFormula = 'default',
  inputs: TraceEntry['inputs'] = {},
): TraceEntry {
  return { quantity, value, unit, formula: given ? 'as given' : defaultFormula, inputs: { default: !given, ...inputs }, reference };
}
