// Pieces of input validation shared by several modules' zod schemas.

/** One line of text: no line breaks or control characters (such text reaches e-mail subjects, cards and logs). */
// eslint-disable-next-line no-control-regex
export const SINGLE_LINE = /^[^\u0000-\u001f\u007f]*$/;
export const SINGLE_LINE_MESSAGE = 'Use one line of text, without line breaks or control characters.';
