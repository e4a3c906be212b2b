import { describe, expect, it } from 'vitest';
import { checkCharacter, credentialNumberFrom, credentialStatus, NUMBER_ALPHABET, normalizeCredentialNumber } from '../../../shared/credentials';

describe('credential numbers', () => {
  it('the check character is the Luhn algorithm generalised to N symbols', () => {
    // With the alphabet 0-9 it is the classic Luhn check digit: 7992739871 → 3 (the worked example of
    // the Luhn algorithm, H. P. Luhn, US patent 2,950,048, as commonly printed).
    expect(checkCharacter('7992739871', '0123456789')).toBe('3');
    // Luhn mod N worked example with the alphabet "abcdef" (N = 6): abcdef → e (from memory of the
    // algorithm's usual published example).
    expect(checkCharacter('abcdef', 'abcdef')).toBe('e');
  });

  it('catches every single mistyped character and every swap of two different neighbours', () => {
    const number = credentialNumberFrom([3, 141, 59, 26, 53, 58, 97, 93]);
    const body = number.replace(/^DPC-|-/g, '').slice(0, 8);
    expect(normalizeCredentialNumber(number)).toBe(number);
    for (let i = 0; i < 8; i++) {
      for (const c of NUMBER_ALPHABET) {
        if (c === body[i]) continue;
        const typo = body.slice(0, i) + c + body.slice(i + 1) + number.slice(-1);
        expect(normalizeCredentialNumber(typo)).toBeNull();
      }
      if (i < 7 && body[i] !== body[i + 1]) {
        const swapped = body.slice(0, i) + body[i + 1] + body[i] + body.slice(i + 2) + number.slice(-1);
        // Luhn mod N misses only the swap of the two symbols whose doubled values wrap to each other.
        const a = NUMBER_ALPHABET.indexOf(body[i]);
        const b = NUMBER_ALPHABET.indexOf(body[i + 1]);
        if (!((a === 0 && b === 31) || (a === 31 && b === 0))) expect(normalizeCredentialNumber(swapped)).toBeNull();
      }
    }
  });

  it('reads what people type: any case, spaces, I and L for 1, O for 0', () => {
    const number = credentialNumberFrom([1, 0, 2, 3, 4, 5, 6, 7]);
    expect(number).toMatch(/^DPC-[0-9A-Z]{4}-[0-9A-Z]{4}-[0-9A-Z]$/);
    const typed = number.toLowerCase().replace(/-/g, ' ').replace(/1/g, 'l').replace(/0/g, 'o');
    expect(normalizeCredentialNumber(typed)).toBe(number);
    expect(normalizeCredentialNumber('DPC-XXXX')).toBeNull();
    expect(normalizeCredentialNumber('')).toBeNull();
  });

  it('status: revoked wins, else expired from the expiry instant', () => {
    const expires = new Date('2027-01-01T00:00:00Z');
    expect(credentialStatus(expires, null, new Date('2026-12-31T23:59:59Z'))).toBe('active');
    expect(credentialStatus(expires, null, expires)).toBe('expired');
    expect(credentialStatus(expires, new Date('2026-06-01Z'), new Date('2026-01-01Z'))).toBe('revoked');
  });
});
