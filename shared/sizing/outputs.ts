import type { ControllerProfile } from '../schemas/controller.js';
import { round, type TraceEntry, type Warning } from './trace.js';

export interface OutputAllocationInput {
  /** Current of each tread's strip; index 0 is tread 1 (the foot). */
  treadCurrentsA: readonly number[];
  profile: ControllerProfile;
  /** Treads wired to one output; 1 by default so treads light one after another. */
  treadsPerOutput?: number;
}

export interface OutputLoad {
  controller: number;
  output: number;
  treads: number[];
  /** Lit landings on this output (1 = the landing above flight 1), when the stair has any. */
  landings?: number[];
  currentA: number;
  withinLimit: boolean;
}

export interface ControllerBlock {
  controller: number;
  firstTread: number;
  lastTread: number;
  treads: number;
  outputsUsed: number;
  currentA: number;
  /** null when the profile gives no maximum input current. */
  withinInputLimit: boolean | null;
  treadCountInRange: boolean;
}

export interface OutputAllocation {
  treadsPerOutput: number;
  outputsNeeded: number;
  outputsPerController: number;
  /** null when the profile has no CV outputs at all. */
  controllersNeeded: number | null;
  controllers: ControllerBlock[];
  outputs: OutputLoad[];
  maxOutputCurrentA: number;
  outputCurrentOk: boolean;
  /** One controller has enough outputs for every tread. */
  outputCountOk: boolean;
  /** The whole stair is within one controller's tread range. */
  treadCountInRange: boolean;
  /** null when the profile gives no maximum input current. */
  inputCurrentOk: boolean | null;
  warnings: Warning[];
}

/**
 * Allocates treads to outputs and, when one controller is not enough, splits the stair into
 * contiguous blocks of near-equal size (balanced so that no controller is left with a stub
 * below its minimum tread count). More controllers are added while a block draws more than
 * the controller's maximum input current.
 */
export function allocateOutputs(input: OutputAllocationInput): OutputAllocation {
  const { treadCurrentsA, profile } = input;
  const perOutput = input.treadsPerOutput ?? 1;
  const n = treadCurrentsA.length;
  const outputsNeeded = Math.ceil(n / perOutput);
  const capacity = Math.min(profile.outputs * perOutput, profile.maxTreads ?? Infinity);
  const warnings: Warning[] = [];
  const inRange = (count: number) =>
    count >= (profile.minTreads ?? 1) && count <= (profile.maxTreads ?? Infinity);

  const controllersNeeded = capacity >= 1 ? controllerCount(treadCurrentsA, capacity, profile.maxInputCurrentA) : null;
  const controllers: ControllerBlock[] = [];
  const outputs: OutputLoad[] = [];
  if (controllersNeeded !== null) {
    let first = 0;
    for (const [c, size] of blockSizes(n, controllersNeeded).entries()) {
      let blockCurrent = 0;
      let used = 0;
      for (let t = first; t < first + size; t += perOutput) {
        const treads: number[] = [];
        let currentA = 0;
        for (let k = t; k < Math.min(t + perOutput, first + size); k++) {
          treads.push(k + 1);
          currentA += treadCurrentsA[k] as number;
        }
        used++;
        blockCurrent += currentA;
        outputs.push({ controller: c + 1, output: used, treads, currentA, withinLimit: currentA <= profile.maxCurrentPerOutputA });
      }
      controllers.push({
        controller: c + 1,
        firstTread: first + 1,
        lastTread: first + size,
        treads: size,
        outputsUsed: used,
        currentA: blockCurrent,
        withinInputLimit: profile.maxInputCurrentA === undefined ? null : blockCurrent <= profile.maxInputCurrentA,
        treadCountInRange: inRange(size),
      });
      first += size;
    }
  }

  const maxOutputCurrentA = outputs.reduce((m, o) => Math.max(m, o.currentA), 0);
  const outputCurrentOk = outputs.every((o) => o.withinLimit);
  const outputCountOk = outputsNeeded <= profile.outputs;
  const treadCountInRange = inRange(n);
  const inputCurrentOk =
    profile.maxInputCurrentA === undefined ? null : controllers.length > 0 && controllers.every((c) => c.withinInputLimit);

  if (controllersNeeded === null) {
    warnings.push({ code: 'no_cv_outputs', message: 'The controller profile has no constant-voltage outputs for tread strips.' });
  }
  if (!outputCurrentOk) {
    warnings.push({
      code: 'output_current_exceeded',
      message: `An output carries ${round(maxOutputCurrentA, 3)} A, above the controller's ${profile.maxCurrentPerOutputA} A per output; use a lower-power strip, shorter pieces or fewer treads per output.`,
    });
  }
  if (!outputCountOk && controllersNeeded !== null) {
    warnings.push({
      code: 'output_count_exceeded',
      message: `${outputsNeeded} outputs are needed but one controller has ${profile.outputs}; ${controllersNeeded} controllers share the treads.`,
    });
  }
  if (!treadCountInRange || controllers.some((c) => !c.treadCountInRange)) {
    warnings.push({
      code: 'tread_count_out_of_range',
      message: `The controller supports ${profile.minTreads ?? 1}–${profile.maxTreads ?? 'any number of'} treads; the stair has ${n}.`,
    });
  }
  if (inputCurrentOk === false) {
    warnings.push({
      code: 'controller_input_current_exceeded',
      message: `A controller would draw more than its ${profile.maxInputCurrentA} A input limit.`,
    });
  }
  return {
    treadsPerOutput: perOutput,
    outputsNeeded,
    outputsPerController: profile.outputs,
    controllersNeeded,
    controllers,
    outputs,
    maxOutputCurrentA,
    outputCurrentOk,
    outputCountOk,
    treadCountInRange,
    inputCurrentOk,
    warnings,
  };
}

/** Sizes of k contiguous blocks covering n treads, differing by at most one. */
export function blockSizes(n: number, k: number): number[] {
  const base = Math.floor(n / k);
  const extra = n % k;
  return Array.from({ length: k }, (_, i) => base + (i < extra ? 1 : 0));
}

function controllerCount(currents: readonly number[], capacity: number, maxInputCurrentA: number | undefined): number {
  const n = currents.length;
  let k = Math.max(1, Math.ceil(n / capacity));
  if (maxInputCurrentA === undefined) return k;
  // A single tread above the input limit cannot be fixed by splitting; stop at one tread each.
  while (k < n && largestBlockCurrent(currents, blockSizes(n, k)) > maxInputCurrentA) k++;
  return k;
}

function largestBlockCurrent(currents: readonly number[], sizes: number[]): number {
  let largest = 0;
  let t = 0;
  for (const size of sizes) {
    let sum = 0;
    for (let i = 0; i < size; i++) sum += currents[t++] as number;
    largest = Math.max(largest, sum);
  }
  return largest;
}

export function outputsTrace(input: OutputAllocationInput, result: OutputAllocation): TraceEntry[] {
  const { profile } = input;
  return [
    {
      quantity: 'outputsNeeded',
      value: result.outputsNeeded,
      unit: 'outputs',
      formula: 'ceil(treads / treadsPerOutput)',
      inputs: {
        treads: input.treadCurrentsA.length,
        treadsPerOutput: result.treadsPerOutput,
        treadsPerOutputDefaulted: input.treadsPerOutput === undefined,
      },
      reference: 'one tread per output so treads light one after another (common practice, no published source)',
    },
    {
      quantity: 'maxOutputCurrentA',
      value: round(result.maxOutputCurrentA),
      unit: 'A',
      formula: 'max over outputs of Σ tread currents on the output ≤ maxCurrentPerOutputA',
      inputs: { maxCurrentPerOutputA: profile.maxCurrentPerOutputA, withinLimit: result.outputCurrentOk },
      reference: 'controller profile',
    },
    {
      quantity: 'controllersNeeded',
      value: result.controllersNeeded ?? 'none possible',
      unit: 'controllers',
      formula: 'ceil(treads / min(outputs × treadsPerOutput, maxTreads)), more while a block exceeds maxInputCurrentA; contiguous near-equal blocks',
      inputs: {
        outputs: profile.outputs,
        maxTreads: profile.maxTreads ?? null,
        minTreads: profile.minTreads ?? null,
        maxInputCurrentA: profile.maxInputCurrentA ?? null,
      },
      reference: 'controller profile',
    },
  ];
}
