/**
 * Credential numbers in Driftproof's own format: "DPC-XXXX-XXXX-C", eight characters of Crockford's
 * base32 alphabet (no I, L, O, U, so nothing is misread) and a check character computed with the
 * Luhn mod N algorithm over that alphabet (N = 32), which catches any single mistyped character
 * and most swaps of neighbours.
 * @module
 */
export const NUMBER_ALPHABET = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';
const N = NUMBER_ALPHABET.length;
const PREFIX = 'DPC';

/** Luhn mod N check character (the published generalisation of the Luhn algorithm to N symbols). */
export function checkCharacter(body: string, alphabet: string = NUMBER_ALPHABET): string {
  const n = alphabet.length;
  let factor = 2;
  let sum = 0;
  for (let i = body.length - 1; i >= 0; i--) {
    const code = alphabet.indexOf(body[i]);
    if (code < 0) throw new Error(`Not a credential character: ${body[i]}`);
    const addend = factor * code;
    factor = factor === 2 ? 1 : 2;
    sum += Math.floor(addend / n) + (addend % n);
  }
  return alphabet[(n - (sum % n)) % n];
}

/** Formats eight body characters as a full number with its check character. */
export function formatCredentialNumber(body: string): string {
  return `${PREFIX}-${body.slice(0, 4)}-${body.slice(4, 8)}-${checkCharacter(body)}`;
}

/** A new number from eight random values 0–255 (the caller supplies the randomness). */
export function credentialNumberFrom(bytes: ArrayLike<number>): string {
  let body = '';
  for (let i = 0; i < 8; i++) body += NUMBER_ALPHABET[bytes[i] % N];
  return formatCredentialNumber(body);
}

/**
 * Reads what a person typed: any case, spaces or dashes, I and L for 1, O for 0. Returns the
 * canonical number, or null when it is not one (wrong length, unknown character, bad check).
 */
export function normalizeCredentialNumber(input: string): string | null {
  let s = input.toUpperCase().replace(/[\s-]+/g, '');
  if (s.startsWith(PREFIX)) s = s.slice(PREFIX.length);
  s = s.replace(/[IL]/g, '1').replace(/O/g, '0');
  if (!/^[0-9A-HJKMNP-TV-Z]{9}$/.test(s)) return null;
  const body = s.slice(0, 8);
  return checkCharacter(body) === s[8] ? formatCredentialNumber(body) : null;
}
