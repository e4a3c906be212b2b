/** What a seat order costs: the unit price from the volume tiers, the total, and the next cheaper tier. */
import { unitPriceFor, type SeatPricing } from '@shared/schemas';

export interface PriceBand {
  /** Smallest quantity of the band. */
  from: number;
  /** Largest quantity of the band; null for "and more". */
  to: number | null;
  unitAmount: number;
}

export interface PriceQuote {
  quantity: number;
  unitAmount: number;
  total: number;
  /** The band the quantity falls in (index into `priceBands`). */
  band: number;
  /** Saved on each seat against the base price (0 in the base band). */
  savingPerSeat: number;
  /** The next cheaper band, if there is one. */
  next: { from: number; unitAmount: number; seatsToGo: number } | null;
}

/** The price list as bands: 1–9 at the base price, 10–49 at the first tier, 50 and more … */
export function priceBands(pricing: SeatPricing): PriceBand[] {
  const bands: PriceBand[] = [];
  const starts = [{ minQuantity: 1, unitAmount: pricing.unitAmount }, ...pricing.tiers];
  starts.forEach((start, index) => {
    const following = starts[index + 1];
    bands.push({ from: start.minQuantity, to: following ? following.minQuantity - 1 : null, unitAmount: start.unitAmount });
  });
  return bands;
}

/** "1 seat", "1–9 seats", "50 seats or more". */
export function bandLabel(band: PriceBand): string {
  if (band.to === null) return `${band.from} seat${band.from === 1 ? '' : 's'} or more`;
  if (band.to === band.from) return `${band.from} seat${band.from === 1 ? '' : 's'}`;
  return `${band.from}–${band.to} seats`;
}

/** The price of `quantity` seats, by the same rule the server charges (`unitPriceFor`). */
export function priceQuote(pricing: SeatPricing, quantity: number): PriceQuote {
  const bands = priceBands(pricing);
  const unitAmount = unitPriceFor(pricing, quantity);
  let band = 0;
  bands.forEach((b, i) => {
    if (quantity >= b.from) band = i;
  });
  const following = bands[band + 1];
  return {
    quantity,
    unitAmount,
    total: unitAmount * quantity,
    band,
    savingPerSeat: Math.max(0, pricing.unitAmount - unitAmount),
    next: following ? { from: following.from, unitAmount: following.unitAmount, seatsToGo: following.from - quantity } : null,
  };
}

/** The cheapest price per seat there is (for "from … a seat"). */
export function lowestUnitAmount(pricing: SeatPricing): number {
  return Math.min(pricing.unitAmount, ...pricing.tiers.map((t) => t.unitAmount));
}
