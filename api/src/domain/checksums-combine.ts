// Joining CRC-16/XMODEM values of consecutive pieces, so that pieces of one image can be summed on
// different threads and put together in order.
//
// CRC-16/XMODEM has init 0, no reflection and xorout 0, so it is linear over GF(2):
// crc(M) = M(x)·x^16 mod P with P = x^16 + x^12 + x^5 + 1 (0x1021; Greg Cook, "Catalogue of
// parametrised CRC algorithms", CRC RevEng). For M = A followed by B (|B| bytes):
//   crc(A‖B) = (A(x)·x^(8|B|) + B(x))·x^16 mod P = crc(A)·x^(8|B|) mod P  xor  crc(B).
// This is the method of zlib's crc32_combine (Mark Adler), for a non-reflected 16-bit CRC.

const POLY = 0x1021;

/** a(x)·b(x) mod P, for 16-bit polynomials (bit 15 = x^15). */
function mulMod(a: number, b: number): number {
  let r = 0;
  for (let bit = 15; bit >= 0; bit--) {
    r = r & 0x8000 ? ((r << 1) ^ POLY) & 0xffff : (r << 1) & 0xffff;
    if ((b >>> bit) & 1) r ^= a;
  }
  return r;
}

const powCache = new Map<number, number>();

/** x^(8·bytes) mod P, by square and multiply. */
function shiftFactor(bytes: number): number {
  const cached = powCache.get(bytes);
  if (cached !== undefined) return cached;
  let result = 1; // x^0
  let base = 0x0100; // x^8: one byte
  for (let n = bytes; n > 0; n = Math.floor(n / 2)) {
    if (n % 2) result = mulMod(result, base);
    base = mulMod(base, base);
  }
  if (powCache.size < 64) powCache.set(bytes, result);
  return result;
}

/** The CRC-16/XMODEM of A followed by B, from crc(A), crc(B) and B's length in bytes. */
export function crc16XmodemCombine(crcA: number, crcB: number, lengthB: number): number {
  return (mulMod(crcA & 0xffff, shiftFactor(lengthB)) ^ crcB) & 0xffff;
}

// CRC-32/ISO-HDLC (reflected, poly 0xEDB88320 in reflected form, init and xorout 0xFFFFFFFF): the
// same identity holds for zlib's crc32 values, the pre- and post-inversion cancelling out; this is
// zlib's crc32_combine as rewritten by Mark Adler in zlib 1.2.12 (multmodp / x2nmodp in crc32.c),
// where bit 31 stands for x^0 because the CRC is reflected.

const POLY32 = 0xedb88320;

/** a(x)·b(x) mod P for reflected 32-bit polynomials. */
function mulMod32(a: number, b: number): number {
  let m = 0x80000000;
  let p = 0;
  for (;;) {
    if (a & m) {
      p ^= b;
      if ((a & (m - 1)) === 0) break;
    }
    m >>>= 1;
    b = b & 1 ? (b >>> 1) ^ POLY32 : b >>> 1;
  }
  return p >>> 0;
}

/** X2N[k] = x^(2^k) mod P. */
const X2N = new Uint32Array(32);
X2N[0] = 0x40000000; // x^1
for (let k = 1; k < 32; k++) X2N[k] = mulMod32(X2N[k - 1], X2N[k - 1]);

const pow32Cache = new Map<number, number>();

/** x^(8·bytes) mod P, reflected. */
function shiftFactor32(bytes: number): number {
  const cached = pow32Cache.get(bytes);
  if (cached !== undefined) return cached;
  let p = 0x80000000; // x^0
  let k = 3; // 8 = 2^3 bits per byte
  for (let n = bytes; n > 0; n = Math.floor(n / 2), k++) {
    if (n % 2) p = mulMod32(X2N[k & 31], p);
  }
  if (pow32Cache.size < 64) pow32Cache.set(bytes, p);
  return p;
}

/** The CRC-32/ISO-HDLC of A followed by B, from crc(A), crc(B) and B's length in bytes. */
export function crc32IsoHdlcCombine(crcA: number, crcB: number, lengthB: number): number {
  return (mulMod32(shiftFactor32(lengthB), crcA >>> 0) ^ crcB) >>> 0;
}
