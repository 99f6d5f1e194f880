/**
 * Raised when the engine is given data or arguments it cannot compute on (unsorted or duplicate
 * dates, malformed dates, non-finite numbers, out-of-range parameters). The message names the
 * offending date or field. A RangeError, so callers may treat it as one; the server answers 422.
 */
export class EngineInputError extends RangeError {
  readonly code = "ENGINE_INPUT";
  readonly date?: string;
  readonly field?: string;

  constructor(message: string, details: { date?: string; field?: string } = {}) {
    super(message);
    this.name = "EngineInputError";
    this.date = details.date;
    this.field = details.field;
  }
}
