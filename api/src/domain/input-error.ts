// The one error the domain computations throw for input they cannot answer for. It carries the
// name of the input at fault so that the API can answer 400 with that field, and the client can
// show the message on the matching control. Plain TypeScript: safe for the client too.

export class CalcInputError extends Error {
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(message);
    this.name = 'CalcInputError';
  }
}

/** Throws a CalcInputError unless `value` is a finite number (optionally above or at a floor). */
export function requireFinite(field: string, value: number, opts: { min?: number; above?: number } = {}): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) throw new CalcInputError(field, 'Must be a number.');
  if (opts.min !== undefined && value < opts.min) throw new CalcInputError(field, `Must be ${opts.min} or more.`);
  if (opts.above !== undefined && value <= opts.above) throw new CalcInputError(field, `Must be more than ${opts.above}.`);
}
