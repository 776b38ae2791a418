// CRC-16/XMODEM (poly 0x1021, init 0x0000, not reflected, xorout 0x0000, check 0x31C3; Greg Cook,
// "Catalogue of parametrised CRC algorithms", CRC RevEng), as a table-driven "slice-by-16".
// No imports at all: the server's checksums (checksums.ts) and the XMODEM engines, which also run
// in the browser, share this one implementation. Its tests are in checksums.test.ts.

// --- CRC-16/XMODEM, slice-by-16 ---------------------------------------------------------------
// TABLE[0..255] is the classic byte-at-a-time table for poly 0x1021 (MSB first). TABLE[s*256+b] is
// the CRC contribution of byte b followed by s zero bytes, so that 16 input bytes can be folded in
// with 16 independent look-ups (the "slicing-by-N" method of Kounavis and Berry, Intel, 2005).
const SLICES = 16;
const TABLE = new Uint16Array(256 * SLICES);
for (let b = 0; b < 256; b++) {
  let c = b << 8;
  for (let k = 0; k < 8; k++) c = c & 0x8000 ? ((c << 1) ^ 0x1021) & 0xffff : (c << 1) & 0xffff;
  TABLE[b] = c;
}
for (let s = 1; s < SLICES; s++) {
  for (let b = 0; b < 256; b++) {
    const prev = TABLE[(s - 1) * 256 + b];
    TABLE[s * 256 + b] = ((prev << 8) & 0xffff) ^ TABLE[prev >>> 8];
  }
}

function crc16Bytewise(data: Uint8Array, from: number, to: number, crc: number): number {
  for (let i = from; i < to; i++) crc = ((crc << 8) & 0xffff) ^ TABLE[((crc >>> 8) ^ data[i]) & 0xff];
  return crc;
}

/** Continues a CRC-16/XMODEM over `data` from `previous` (0 to start). */
export function crc16XmodemUpdate(data: Uint8Array, previous = 0): number {
  let crc = previous & 0xffff;
  const n = data.length;
  // Bytes until the view is 4-byte aligned, so the body can be read as 32-bit words.
  const lead = Math.min(n, (4 - (data.byteOffset & 3)) & 3);
  crc = crc16Bytewise(data, 0, lead, crc);
  const groups = (n - lead) >>> 4;
  if (groups > 0) {
    const words = new Uint32Array(data.buffer, data.byteOffset + lead, groups * 4);
    // The words are read little-endian (every platform Node runs on): byte 0 is the low byte.
    for (let j = 0; j < words.length; j += 4) {
      const w0 = words[j];
      const w1 = words[j + 1];
      const w2 = words[j + 2];
      const w3 = words[j + 3];
      crc =
        TABLE[3840 + ((w0 & 0xff) ^ (crc >>> 8))] ^
        TABLE[3584 + (((w0 >>> 8) & 0xff) ^ (crc & 0xff))] ^
        TABLE[3328 + ((w0 >>> 16) & 0xff)] ^
        TABLE[3072 + (w0 >>> 24)] ^
        TABLE[2816 + (w1 & 0xff)] ^
        TABLE[2560 + ((w1 >>> 8) & 0xff)] ^
        TABLE[2304 + ((w1 >>> 16) & 0xff)] ^
        TABLE[2048 + (w1 >>> 24)] ^
        TABLE[1792 + (w2 & 0xff)] ^
        TABLE[1536 + ((w2 >>> 8) & 0xff)] ^
        TABLE[1280 + ((w2 >>> 16) & 0xff)] ^
        TABLE[1024 + (w2 >>> 24)] ^
        TABLE[768 + (w3 & 0xff)] ^
        TABLE[512 + ((w3 >>> 8) & 0xff)] ^
        TABLE[256 + ((w3 >>> 16) & 0xff)] ^
        TABLE[w3 >>> 24];
    }
  }
  return crc16Bytewise(data, lead + groups * 16, n, crc);
}
