/**
 * Input the schemas could not rule out but the engine cannot size (a conductor size a table
 * does not list, a metric size with an AWG table). `path` names the request field, so the API
 * can answer 400 with `errors: [{ path, message }]` instead of a 500.
 */
export class SizingInputError extends Error {
  override readonly name = 'SizingInputError';

  constructor(
    readonly path: string[],
    message: string,
    /** Stable snake_case code for problem+json. */
    readonly code: string = 'invalid_sizing_input',
  ) {
    super(message);
  }
}
