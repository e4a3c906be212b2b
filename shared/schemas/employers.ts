import { z } from 'zod';
import { emailSchema, newPasswordSchema, personNameSchema } from './fields';

export const organizationNameSchema = z.string({ error: 'Enter the organization name.' }).trim().min(2, 'Enter the organization name.').max(200);

/** A company signs up: its organization and its first employer account. */
export const employerSignupSchema = z.strictObject({
  organizationName: organizationNameSchema,
  name: personNameSchema,
  email: emailSchema,
  password: newPasswordSchema,
});
export type EmployerSignup = z.infer<typeof employerSignupSchema>;

export const tokenSchema = z.strictObject({
  token: z.string({ error: 'The link is incomplete.' }).regex(/^[A-Za-z0-9_-]{43}$/, 'The link is incomplete or damaged.'),
});

export const organizationUpdateSchema = z
  .strictObject({
    name: organizationNameSchema.optional(),
    billingEmail: emailSchema.nullable().optional(),
    address: z.string().trim().max(500, 'At most 500 characters.').nullable().optional(),
  })
  .refine((v) => Object.keys(v).length > 0, { message: 'Nothing to change.' });

export interface OrganizationProfile {
  id: number;
  name: string;
  billingEmail: string | null;
  address: string | null;
  seatBalance: number;
}

/** Seat price in the smallest currency unit, with cheaper tiers from a quantity on. */
export const seatPricingSchema = z
  .strictObject({
    currency: z.string().regex(/^[a-z]{3}$/, 'A three-letter currency code in lower case, e.g. eur.'),
    unitAmount: z.number().int().min(50, 'At least 50 (smallest currency unit).').max(10_000_00),
    tiers: z.array(z.strictObject({ minQuantity: z.number().int().min(2).max(1000), unitAmount: z.number().int().min(50).max(10_000_00) })).max(10),
  })
  .refine((p) => p.tiers.every((t, i) => i === 0 || t.minQuantity > p.tiers[i - 1].minQuantity), { message: 'Tiers go from smaller to larger quantities.', path: ['tiers'] });
export type SeatPricing = z.infer<typeof seatPricingSchema>;

/** The price per seat for a quantity: the tier with the largest minimum the quantity reaches. */
export function unitPriceFor(pricing: SeatPricing, quantity: number): number {
  return pricing.tiers.filter((t) => quantity >= t.minQuantity).reduce((price, t) => t.unitAmount, pricing.unitAmount);
}

export const MAX_ORDER_SEATS = 500;
export const seatOrderSchema = z.strictObject({
  quantity: z.number({ error: 'Enter how many seats.' }).int('Whole seats only.').min(1, 'Buy at least one seat.').max(MAX_ORDER_SEATS, `At most ${MAX_ORDER_SEATS} seats an order.`),
});

export const refundSchema = z.strictObject({
  quantity: z.number().int().min(1, 'Refund at least one seat.').max(1000),
});

export const seatGrantSchema = z.strictObject({
  count: z.number().int().min(1, 'Grant at least one seat.').max(500, 'Grant at most 500 seats at a time.'),
});

export interface SeatOrderView {
  id: string;
  quantity: number;
  unitAmount: number;
  amountTotal: number;
  currency: string;
  status: 'pending' | 'paid' | 'expired' | 'refunded' | 'partially_refunded';
  refundedQuantity: number;
  createdAt: string;
  paidAt: string | null;
}

const levelIds = z.array(z.string().regex(/^[a-z0-9][a-z0-9-]{1,63}$/, 'Not a level id.')).max(20);

export const operatorEnrolSchema = z.strictObject({
  email: emailSchema,
  name: personNameSchema,
  levelIds: levelIds.default([]),
});
export type OperatorEnrol = z.infer<typeof operatorEnrolSchema>;

export const levelAssignmentSchema = z.strictObject({ levelIds });

/** CSV roster: one operator a row. */
export const ROSTER_COLUMNS = ['email', 'name', 'levels'] as const;
export const ROSTER_MAX_BYTES = 5 * 1024 * 1024;
export const ROSTER_MAX_ROWS = 2000;

export interface RosterRow {
  /** Line in the file (the header is line 1). */
  line: number;
  email: string;
  name: string;
  levelIds: string[];
  /** new: will be invited; existing: already an operator here (levels are merged); duplicate: repeats an earlier row. */
  status: 'new' | 'existing' | 'duplicate';
  errors: string[];
}

export interface RosterPreview {
  rows: RosterRow[];
  errors: number;
  toInvite: number;
  toUpdate: number;
  duplicates: number;
}

export interface LevelProgress {
  levelId: string;
  assigned: boolean;
  trialsPassed: number;
  trialsRequired: number;
  status: 'not_started' | 'in_progress' | 'passed';
}

export interface OperatorProgress {
  id: number;
  name: string;
  email: string;
  active: boolean;
  /** Invited but has not chosen a password yet. */
  invited: boolean;
  lastSignInAt: string | null;
  levels: LevelProgress[];
}

/** Revoking a credential needs a written reason. */
export const revokeCredentialSchema = z.strictObject({
  reason: z.string({ error: 'Write the reason.' }).trim().min(1, 'Write the reason.').min(10, 'Write the reason in at least 10 characters.').max(2000, 'Keep the reason under 2000 characters.'),
});
