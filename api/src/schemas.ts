// Pieces of input validation shared by several modules' zod schemas.
import { z } from 'zod';

/** One line of text: no line breaks or control characters (such text reaches e-mail subjects, cards and logs). */
// eslint-disable-next-line no-control-regex
export const SINGLE_LINE = /^[^\u0000-\u001f\u007f]*$/;
export const SINGLE_LINE_MESSAGE = 'Use one line of text, without line breaks or control characters.';

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
