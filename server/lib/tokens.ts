import { createHash, randomBytes } from 'node:crypto';

// RFC 4648 base32 alphabet: upper-case letters and 2-7, easy to read aloud and type on a tablet.
const BASE32 = 'ABCDEFGHIJKLMNOPQRSTUVWXYZ234567';

/**
 * A one-time code from the CSPRNG: 20 bytes = 160 bits (A5-11.5.1 asks for at least 128), written
 * as base32 in groups of four (e.g. "K7QD-…"), so it can be shown as text and typed by hand.
 */
export function newOneTimeCode(bytes = 20): string {
  const buf = randomBytes(bytes);
  let bits = 0, value = 0, out = '';
  for (const byte of buf) {
    value = (value << 8) | byte;
    bits += 8;
    while (bits >= 5) {
      out += BASE32[(value >>> (bits - 5)) & 31];
      bits -= 5;
    }
  }
  if (bits > 0) out += BASE32[(value << (5 - bits)) & 31];
  return out.match(/.{1,4}/g)!.join('-');
}

/** The form a code is stored and compared in: case, spaces and dashes do not matter when typing. */
export function normaliseCode(code: string): string {
  return code.toUpperCase().replace(/[^A-Z2-7]/g, '');
}

export function sha256Hex(text: string): string {
  return createHash('sha256').update(text, 'utf8').digest('hex');
}

/** Only this hash of a one-time code is stored; a database reader cannot use it to redeem the code. */
export function codeHash(code: string): string {
  return sha256Hex(normaliseCode(code));
}
