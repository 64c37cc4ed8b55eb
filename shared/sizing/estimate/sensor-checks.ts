import type { EstimateCheck } from '../../schemas/estimate.js';
import { flagged, passed, type Design } from './checks.js';

const TYPE_REFERENCE = 'PNP sources, NPN sinks (three-wire DC sensor outputs, IEC 60947-5-2); stair-controller inputs are usually PNP (common practice, no published source)';

function inputReference(d: Design): string {
  return d.sensors.controllerInput.source === 'profile' ? 'controller profile' : 'typical stair-controller input: PNP, 5 V, about 10 mA (common practice, no published source)';
}

function wantedSensor(d: Design): string {
  const i = d.sensors.controllerInput;
  return `a ${i.type.toUpperCase()} sensor for ${i.supplyV} V drawing at most ${i.maxCurrentMa} mA`;
}

export function sensorTypeCheck(d: Design): EstimateCheck {
  const { motion, controllerInput } = d.sensors;
  const expected = controllerInput.type;
  if (!motion) {
    return flagged(
      'sensor-type',
      'warn',
      `No motion sensor is described; the controller input expects ${expected.toUpperCase()}.`,
      null,
      expected,
      '',
      TYPE_REFERENCE,
      `Choose ${wantedSensor(d)} and give it as sensors.motion.`,
    );
  }
  if (motion.outputType !== expected) {
    return flagged(
      'sensor-type',
      'fail',
      `The sensor's output is ${motion.outputType.toUpperCase()} but the controller input expects ${expected.toUpperCase()}: it will not trigger as wired.`,
      motion.outputType,
      expected,
      '',
      TYPE_REFERENCE,
      `Fit a ${motion.outputType.toUpperCase()}-to-${expected.toUpperCase()} interface for each of the ${d.sensors.plan.motionSensors} sensors, or choose ${expected.toUpperCase()} sensors.`,
    );
  }
  if (controllerInput.source === 'typical') {
    return flagged(
      'sensor-type',
      'warn',
      `The sensor is ${motion.outputType.toUpperCase()}; the profile does not say what its input expects (PNP is usual).`,
      motion.outputType,
      expected,
      '',
      TYPE_REFERENCE,
      'Confirm on the controller’s datasheet that its sensor input is PNP, and add sensorInput to the profile.',
    );
  }
  return passed('sensor-type', `${motion.outputType.toUpperCase()} sensors on a ${expected.toUpperCase()} input.`, motion.outputType, expected, '', TYPE_REFERENCE);
}

export function sensorCurrentCheck(d: Design): EstimateCheck {
  const { motion, controllerInput } = d.sensors;
  const limit = controllerInput.maxCurrentMa;
  if (!motion) {
    return flagged(
      'sensor-current',
      'warn',
      `No motion sensor is described; each input gives at most ${limit} mA.`,
      null,
      limit,
      'mA',
      inputReference(d),
      `Choose ${wantedSensor(d)}.`,
    );
  }
  if (motion.currentMa > limit) {
    return flagged(
      'sensor-current',
      'fail',
      `Each sensor draws ${motion.currentMa} mA; the controller input gives at most ${limit} mA.`,
      motion.currentMa,
      limit,
      'mA',
      inputReference(d),
      `Choose a sensor drawing at most ${limit} mA, or power the sensors from their own ${motion.supplyV} V supply and use the input for the signal only.`,
    );
  }
  return passed('sensor-current', `Each sensor draws ${motion.currentMa} mA of the ${limit} mA an input gives.`, motion.currentMa, limit, 'mA', inputReference(d));
}

export function sensorSupplyCheck(d: Design): EstimateCheck | null {
  const { motion, controllerInput, plan } = d.sensors;
  if (!motion) return null;
  if (plan.supplyMatch === false) {
    return flagged(
      'sensor-supply',
      'fail',
      `The sensor is rated for ${motion.supplyV} V but the controller supplies ${controllerInput.supplyV} V to its sensors.`,
      motion.supplyV,
      controllerInput.supplyV,
      'V',
      inputReference(d),
      `Choose sensors rated for ${controllerInput.supplyV} V, or power them from a separate ${motion.supplyV} V supply with a common 0 V.`,
    );
  }
  return passed('sensor-supply', `Sensors rated ${motion.supplyV} V on the controller's ${controllerInput.supplyV} V sensor supply.`, motion.supplyV, controllerInput.supplyV, 'V', inputReference(d));
}

/** A controller reads a fixed number of sensors (often two): foot, head and entered landings must fit (issue 8). */
export function sensorInputsCheck(d: Design): EstimateCheck | null {
  const w = d.sensors.wiring;
  if (!w || d.sensors.plan.motionSensors === 0) return null;
  const reference = w.sensorInputsDefaulted ? 'two sensor inputs per controller, foot and head (common practice, from memory)' : 'controller profile';
  const on = d.controllers > 1 ? ` on controller ${w.busiestController}` : '';
  if (w.mostOnOneController <= w.sensorInputs) {
    const text = `${w.mostOnOneController} motion sensor${w.mostOnOneController === 1 ? '' : 's'}${on} on ${w.sensorInputs} sensor inputs`;
    if (w.sensorInputsDefaulted) {
      return flagged('sensor-inputs', 'warn', `${text} (the profile does not say how many; 2 assumed).`, w.mostOnOneController, w.sensorInputs, 'sensors', reference, 'Confirm the number of sensor inputs on the controller’s datasheet and add sensorInputs to the profile.');
    }
    return passed('sensor-inputs', `${text}.`, w.mostOnOneController, w.sensorInputs, 'sensors', reference);
  }
  return flagged(
    'sensor-inputs',
    'fail',
    `${w.mostOnOneController} motion sensors${on} but the controller has ${w.sensorInputs} sensor input${w.sensorInputs === 1 ? '' : 's'}.`,
    w.mostOnOneController,
    w.sensorInputs,
    'sensors',
    reference,
    `Choose a controller with at least ${w.mostOnOneController} sensor inputs, or join the landing sensor to the nearest foot or head input through an OR interface (e.g. diodes on PNP outputs; check the controller's datasheet allows it).`,
  );
}
