import { describe, expect, it } from 'vitest';
import { unitPriceFor, type SeatPricing } from '@shared/schemas';
import { formatMoney, minorUnitDigits, toMajor, toMinor } from '@/components/employer/money';
import { bandLabel, lowestUnitAmount, priceBands, priceQuote } from '@/components/employer/pricing';

/** The demo pricing of migration 0004: 49.00, 44.00 from 10 seats, 39.00 from 50. */
const demo: SeatPricing = {
  currency: 'eur',
  unitAmount: 4900,
  tiers: [
    { minQuantity: 10, unitAmount: 4400 },
    { minQuantity: 50, unitAmount: 3900 },
  ],
};

describe('price bands', () => {
  it('turns the base price and the tiers into bands that cover every quantity once', () => {
    expect(priceBands(demo)).toEqual([
      { from: 1, to: 9, unitAmount: 4900 },
      { from: 10, to: 49, unitAmount: 4400 },
      { from: 50, to: null, unitAmount: 3900 },
    ]);
    expect(priceBands({ currency: 'eur', unitAmount: 5000, tiers: [] })).toEqual([{ from: 1, to: null, unitAmount: 5000 }]);
  });

  it('labels bands in words', () => {
    expect(priceBands(demo).map(bandLabel)).toEqual(['1–9 seats', '10–49 seats', '50 seats or more']);
    expect(bandLabel({ from: 1, to: 1, unitAmount: 1 })).toBe('1 seat');
    expect(bandLabel({ from: 1, to: null, unitAmount: 1 })).toBe('1 seat or more');
    expect(lowestUnitAmount(demo)).toBe(3900);
  });
});

describe('price quote', () => {
  it('charges 12 seats at the 10-seat tier and names the next cheaper tier', () => {
    // 12 × 44.00 = 528.00, the figure the API test expects for the same order.
    expect(priceQuote(demo, 12)).toEqual({
      quantity: 12,
      unitAmount: 4400,
      total: 52800,
      band: 1,
      savingPerSeat: 500,
      next: { from: 50, unitAmount: 3900, seatsToGo: 38 },
    });
  });

  it('changes price exactly at the tier boundaries', () => {
    expect([1, 9, 10, 49, 50, 500].map((q) => priceQuote(demo, q).unitAmount)).toEqual([4900, 4900, 4400, 4400, 3900, 3900]);
    expect(priceQuote(demo, 50).next).toBeNull();
    expect(priceQuote(demo, 1).savingPerSeat).toBe(0);
  });

  it('agrees with the rule the server charges by (unitPriceFor) for every order size', () => {
    for (let q = 1; q <= 500; q++) {
      const quote = priceQuote(demo, q);
      expect(quote.unitAmount).toBe(unitPriceFor(demo, q));
      expect(quote.total).toBe(unitPriceFor(demo, q) * q);
      const band = priceBands(demo)[quote.band];
      expect(q >= band.from && (band.to === null || q <= band.to)).toBe(true);
    }
  });
});

describe('money', () => {
  it('reads amounts in the smallest unit of their currency', () => {
    // ISO 4217 minor units: EUR 2, JPY 0, KWD 3 (published table, via Intl).
    expect(minorUnitDigits('eur')).toBe(2);
    expect(minorUnitDigits('jpy')).toBe(0);
    expect(minorUnitDigits('kwd')).toBe(3);
    expect(toMajor(4900, 'eur')).toBe(49);
    expect(toMinor(49.5, 'eur')).toBe(4950);
    expect(toMinor(0.1 + 0.2, 'eur')).toBe(30);
    expect(toMinor(500, 'jpy')).toBe(500);
  });

  it('formats for the reader', () => {
    expect(formatMoney(52800, 'eur', 'en-GB')).toBe('€528.00');
    expect(formatMoney(4900, 'EUR', 'de-DE')).toMatch(/^49,00\s€$/);
    expect(formatMoney(1200, 'jpy', 'en-GB')).toBe('JP¥1,200');
  });
});
