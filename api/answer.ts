import { MAX_ANSWER_BYTES } from '../shared/tables/limits.js';
import { HttpProblem } from './problem.js';

/**
 * The answer serialized once, measured where it is built: a valid design whose answer would pass
 * MAX_ANSWER_BYTES is a 422 rather than megabytes on the wire (a design that fails checks is a 200).
 */
export function serializeAnswer(answer: unknown): string {
  const body = JSON.stringify(answer);
  const bytes = Buffer.byteLength(body);
  if (bytes > MAX_ANSWER_BYTES) {
    throw new HttpProblem(
      422,
      'answer_too_large',
      'Answer too large',
      `The answer would be ${bytes} bytes, over the ${MAX_ANSWER_BYTES}-byte ceiling. Size the run in parts (fewer pixels or treads per request), or use longer feed lengths or higher feed currents.`,
    );
  }
  return body;
}
