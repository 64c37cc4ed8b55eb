import type { EstimateCheck } from '../../schemas/estimate.js';
import { cableCurrentCheck, cableDropCheck, cableMinSizeCheck, cableRunLengthCheck } from './cable-checks.js';
import type { Design } from './checks.js';
import { controllerInputCheck, outputCountCheck, outputCurrentCheck } from './output-checks.js';
import {
  brightnessCapCheck,
  dataLineLengthCheck,
  dataLogicLevelCheck,
  feedPointCurrentCheck,
  pixelCurrentCheck,
  pixelsPerOutputCheck,
  pixelsTotalCheck,
  railGroupingCheck,
  railHoldsPixelsCheck,
  refreshRateCheck,
} from './pixel-checks.js';
import { sensorCurrentCheck, sensorInputsCheck, sensorSupplyCheck, sensorTypeCheck } from './sensor-checks.js';
import { pieceFitsReelCheck, stripFitsCheck, treadCountCheck } from './stair-checks.js';
import { circuitProtectionCheck, class2Check, driverLoadingCheck, feederDeratingCheck, selvCheck } from './supply-checks.js';

/** Every check that applies to the design, in a stable order; those that do not apply are left out. */
const CHECKS: readonly ((d: Design) => EstimateCheck | null)[] = [
  treadCountCheck,
  stripFitsCheck,
  outputCountCheck,
  outputCurrentCheck,
  controllerInputCheck,
  pixelsPerOutputCheck,
  pixelsTotalCheck,
  refreshRateCheck,
  railGroupingCheck,
  driverLoadingCheck,
  class2Check,
  selvCheck,
  circuitProtectionCheck,
  feederDeratingCheck,
  cableDropCheck,
  cableCurrentCheck,
  cableRunLengthCheck,
  cableMinSizeCheck,
  sensorTypeCheck,
  sensorCurrentCheck,
  sensorSupplyCheck,
  pieceFitsReelCheck,
  // Added for issue 8 (pixels, data lines, sensors):
  pixelCurrentCheck,
  brightnessCapCheck,
  dataLineLengthCheck,
  dataLogicLevelCheck,
  sensorInputsCheck,
  feedPointCurrentCheck,
  railHoldsPixelsCheck,
];

export function runChecks(d: Design): EstimateCheck[] {
  const checks: EstimateCheck[] = [];
  for (const run of CHECKS) {
    const c = run(d);
    if (c) checks.push(c);
  }
  return checks;
}
