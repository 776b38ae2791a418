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

/**
 * The sane range of one input: the API's query schemas and the domain functions check the same
 * numbers and say the same words. `aboveMin`: the minimum itself is refused (e.g. 0 W).
 */
export interface InputBound {
  min: number;
  max: number;
  aboveMin?: boolean;
  /** Unit written after the numbers in the message ("W", "Ω"); empty for a plain ratio. */
  unit: string;
  /** Why the range ends where it does, said after the range (optional). */
  why?: string;
}

/** "Must be more than 0 and at most 10000 W." / "Must be from 1 to 100." */
export function boundMessage(bound: InputBound): string {
  const unit = bound.unit ? ` ${bound.unit}` : '';
  const range = bound.aboveMin ? `more than ${bound.min} and at most ${bound.max}${unit}` : `from ${bound.min} to ${bound.max}${unit}`;
  return `Must be ${range}${bound.why ? ` (${bound.why})` : ''}.`;
}

export function withinBound(value: number, bound: InputBound): boolean {
  return Number.isFinite(value) && (bound.aboveMin ? value > bound.min : value >= bound.min) && value <= bound.max;
}

/** Throws a CalcInputError on `field` unless `value` is a finite number inside `bound`. */
export function requireBound(field: string, value: number, bound: InputBound): void {
  requireFinite(field, value);
  if (!withinBound(value, bound)) throw new CalcInputError(field, boundMessage(bound));
}
