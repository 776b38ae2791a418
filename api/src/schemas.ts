// Pieces of input validation shared by several modules' zod schemas.
import { z } from 'zod';

/**
 * One line of text (such text reaches e-mail subjects, cards and logs). Refused: C0 controls and
 * DEL, C1 controls U+0080-U+009F (U+0085 is a line break), the line and paragraph separators
 * U+2028/U+2029, the bidirectional embeddings, overrides and isolates U+202A-U+202E and
 * U+2066-U+2069 (they reorder what a reader sees: Unicode Standard Annex #9; CVE-2021-42574), and
 * lone surrogates (not text at all; with the u flag a pair is one code point and passes).
 */
// eslint-disable-next-line no-control-regex
export const SINGLE_LINE = /^[^\u0000-\u001f\u007f-\u009f\u2028\u2029\u202a-\u202e\u2066-\u2069\ud800-\udfff]*$/u;
export const SINGLE_LINE_MESSAGE = 'Use one line of text, without line breaks or control characters.';

/**
 * An id in a path or a query: plain decimal digits, no sign, no leading zero, no hex, exponent or
 * fraction (Number() and z.coerce would read "0x11", "+17", "017" and "17.0" all as 17), within
 * the range of the UNSIGNED INT columns.
 */
export const ID_MESSAGE = 'Use an id in plain digits, like 17.';
export const idSchema = z
  .string(ID_MESSAGE)
  .regex(/^[1-9][0-9]{0,9}$/, ID_MESSAGE)
  .transform(Number)
  .refine((n) => n <= 4_294_967_295, ID_MESSAGE);

/** A whole number in a query string (page, pageSize): plain digits like an id, between min and max. */
export const queryInt = (min: number, max: number, fallback: number) =>
  z
    .string(`Use a whole number from ${min} to ${max}.`)
    .regex(/^(0|[1-9][0-9]{0,8})$/, `Use a whole number from ${min} to ${max}.`)
    .transform(Number)
    .refine((n) => n >= min && n <= max, `Use a whole number from ${min} to ${max}.`)
    .optional()
    .transform((n) => n ?? fallback);

// zod's own wording for a missing or wrong-typed field ("Invalid input: expected string, received
// undefined") means nothing to a club member; say it in plain words for every schema at once.
// A schema's own message still wins where it gives one.
z.config({
  customError: (issue) => {
    if (issue.code !== 'invalid_type') return undefined;
    if (issue.input === undefined || issue.input === null) return 'This is required.';
    const expected: Record<string, string> = {
      string: 'Enter text here.',
      number: 'Enter a number here.',
      boolean: 'Answer yes or no here.',
      array: 'Send a list here.',
      object: 'Send the fields of this group.',
    };
    return expected[issue.expected] ?? 'This value has the wrong type.';
  },
});
