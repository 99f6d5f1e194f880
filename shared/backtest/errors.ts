/**
 * Raised when the engine is given data it cannot compute on (unsorted or duplicate dates,
 * malformed dates, non-finite numbers). The message names the offending date so an analyst
 * can find the row.
 */
export class EngineInputError extends Error {
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
