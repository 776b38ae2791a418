// Client mistakes caught below our own code (body-parser, raw-body, the router's path decoding,
// serve-static, http-errors) carry an HTTP status of their own. Each one below 500 keeps that
// status and gets the API's one error shape, in our words: their messages may echo the input.
// The JSON body parser's options live here too, because they decide which of these errors occur.

export interface ClientErrorAnswer {
  status: number;
  body: { error: { code: string; message: string } };
}

const answer = (status: number, code: string, message: string): ClientErrorAnswer => ({ status, body: { error: { code, message } } });

/** By body-parser's error `type` (see body-parser/lib/read.js and raw-body). */
const BY_TYPE: Record<string, ClientErrorAnswer> = {
  'entity.parse.failed': answer(400, 'invalid_json', 'The request body is not valid JSON.'),
  'entity.too.large': answer(413, 'too_large', 'The request is too large.'),
  'charset.unsupported': answer(415, 'unsupported_charset', 'Send JSON encoded as UTF-8 (Content-Type: application/json; charset=utf-8).'),
  'encoding.unsupported': answer(415, 'unsupported_encoding', 'The server cannot read that Content-Encoding. Send the body uncompressed, or compressed with gzip, deflate or br.'),
  'encoding.invalid': answer(400, 'invalid_encoding', 'The request body is not valid UTF-8. Send it again as UTF-8 text.'),
  'request.size.invalid': answer(400, 'bad_request', 'The request body was shorter or longer than its Content-Length said. Send it again.'),
  'request.aborted': answer(400, 'bad_request', 'The request body was cut off. Send it again.'),
};

/** By status, for every other error with a 4xx status. */
const BY_STATUS: Record<number, [string, string]> = {
  400: ['bad_request', 'The server could not read this request. Check the address and the body, and send it again.'],
  401: ['not_signed_in', 'Sign in to continue.'],
  403: ['forbidden', 'Your account is not allowed to do that.'],
  404: ['not_found', 'Not found.'],
  405: ['method_not_allowed', 'That method is not allowed here.'],
  408: ['request_timeout', 'The request took too long to arrive. Send it again.'],
  411: ['length_required', 'Send a Content-Length with the body.'],
  413: ['too_large', 'The request is too large.'],
  414: ['uri_too_long', 'The address is too long.'],
  415: ['unsupported_media_type', 'The server cannot read a body of that type. Send JSON as UTF-8.'],
  416: ['range_not_satisfiable', 'That part of the file does not exist.'],
  431: ['headers_too_large', 'The request headers are too large.'],
};

/**
 * The 4xx answer for an error that is the client's doing, or undefined for anything else (then the
 * central handler answers 500 or 503 as before).
 */
export function clientErrorAnswer(err: unknown): ClientErrorAnswer | undefined {
  if (typeof err !== 'object' || err === null) return undefined;
  const e = err as { type?: unknown; status?: unknown; statusCode?: unknown; code?: unknown };
  const status = typeof e.status === 'number' ? e.status : typeof e.statusCode === 'number' ? e.statusCode : undefined;
  if (status === undefined || !Number.isInteger(status) || status < 400 || status > 499) return undefined;
  if (typeof e.type === 'string' && BY_TYPE[e.type]?.status === status) return BY_TYPE[e.type];
  // zlib's errors (Z_DATA_ERROR, Z_BUF_ERROR, ...) when a gzip/deflate/br body is not what it claims.
  if (typeof e.code === 'string' && e.code.startsWith('Z_') && status === 400) {
    return answer(400, 'invalid_encoding', 'The request body does not decompress as its Content-Encoding says. Send it again.');
  }
  // The router's own words for a path that does not percent-decode ("Failed to decode param").
  if (err instanceof URIError && status === 400) {
    return answer(400, 'invalid_path', 'The address has broken percent-encoding (a % not followed by two hex digits, or bytes that are not UTF-8). Check the link.');
  }
  const [code, message] = BY_STATUS[status] ?? ['bad_request', 'The server could not accept this request. Check it and send it again.'];
  return answer(status, code, message);
}

const strictUtf8 = new TextDecoder('utf-8', { fatal: true });

/**
 * Options for express.json(): JSON between systems is UTF-8 (RFC 8259, section 8.1), so any other
 * declared charset is refused with 415 rather than guessed at, and bytes that are not UTF-8 with
 * 400 rather than silently turned into U+FFFD.
 */
export const jsonBodyOptions = {
  limit: '64kb',
  verify(_req: unknown, _res: unknown, body: Buffer, encoding: string | null): void {
    const charset = (encoding ?? 'utf-8').toLowerCase();
    if (charset !== 'utf-8' && charset !== 'utf8') {
      throw Object.assign(new Error(`unsupported charset ${charset}`), { status: 415, type: 'charset.unsupported' });
    }
    try {
      strictUtf8.decode(body);
    } catch {
      throw Object.assign(new Error('body is not UTF-8'), { status: 400, type: 'encoding.invalid' });
    }
  },
};
