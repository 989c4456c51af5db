/**
 * SHA-1 (FIPS 180-4, section 6.1) of an ASCII string, in plain TypeScript so the leap-second list can be
 * verified without Node APIs (the browser console shares this code). Used only to check the `#h` line of a
 * `leap-seconds.list`, which that format defines as SHA-1; it is not used for any security purpose.
 */

/** SHA-1 of the bytes of `ascii` (characters must be < 0x80), as 40 lowercase hex digits. */
export function sha1HexOfAscii(ascii: string): string {
  const bytes = new Uint8Array(((ascii.length + 8) >> 6 << 6) + 64);
  for (let i = 0; i < ascii.length; i++) bytes[i] = ascii.charCodeAt(i) & 0x7f;
  bytes[ascii.length] = 0x80;
  const bitLength = ascii.length * 8;
  const view = new DataView(bytes.buffer);
  view.setUint32(bytes.length - 8, Math.floor(bitLength / 2 ** 32));
  view.setUint32(bytes.length - 4, bitLength >>> 0);
  const h = [0x67452301, 0xefcdab89, 0x98badcfe, 0x10325476, 0xc3d2e1f0];
  const w = new Uint32Array(80);
  for (let block = 0; block < bytes.length; block += 64) {
    for (let t = 0; t < 16; t++) w[t] = view.getUint32(block + 4 * t);
    for (let t = 16; t < 80; t++) {
      const x = w[t - 3] ^ w[t - 8] ^ w[t - 14] ^ w[t - 16];
      w[t] = (x << 1) | (x >>> 31);
    }
    let [a, b, c, d, e] = h;
    for (let t = 0; t < 80; t++) {
      const f = t < 20 ? (b & c) | (~b & d) : t < 40 ? b ^ c ^ d : t < 60 ? (b & c) | (b & d) | (c & d) : b ^ c ^ d;
      const k = t < 20 ? 0x5a827999 : t < 40 ? 0x6ed9eba1 : t < 60 ? 0x8f1bbcdc : 0xca62c1d6;
      const temp = (((a << 5) | (a >>> 27)) + f + e + k + w[t]) >>> 0;
      e = d;
      d = c;
      c = (b << 30) | (b >>> 2);
      b = a;
      a = temp;
    }
    h[0] = (h[0] + a) >>> 0;
    h[1] = (h[1] + b) >>> 0;
    h[2] = (h[2] + c) >>> 0;
    h[3] = (h[3] + d) >>> 0;
    h[4] = (h[4] + e) >>> 0;
  }
  return h.map((x) => x.toString(16).padStart(8, '0')).join('');
}
