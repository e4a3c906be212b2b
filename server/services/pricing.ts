/** Seat pricing, set by the admin and stored in the settings table. */
import { QueryTypes, type Transaction } from 'sequelize';
import { seatPricingSchema, type SeatPricing } from '../../shared/schemas';
import type { AppContext } from '../context';

export async function seatPricing({ sequelize }: AppContext, transaction?: Transaction): Promise<SeatPricing> {
  const [row] = await sequelize.query<{ value: unknown }>(`SELECT value FROM settings WHERE key = 'seat_pricing'`, { type: QueryTypes.SELECT, transaction });
  return seatPricingSchema.parse(row.value);
}

export async function setSeatPricing({ sequelize }: AppContext, pricing: SeatPricing): Promise<SeatPricing> {
  await sequelize.query(
    `INSERT INTO settings (key, value, updated_at) VALUES ('seat_pricing', :value, now())
     ON CONFLICT (key) DO UPDATE SET value = excluded.value, updated_at = now()`,
    { replacements: { value: JSON.stringify(pricing) } },
  );
  return pricing;
}
