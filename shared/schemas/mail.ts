import { z } from 'zod';
import { pageQuerySchema } from './users';

export const mailListQuerySchema = pageQuerySchema.extend({
  sortOrder: z.enum(['asc', 'desc']).default('desc'),
  q: z.string().trim().max(100).optional(),
});
export type MailListQuery = z.infer<typeof mailListQuerySchema>;

/** A message the local mail sink captured. */
export interface CapturedMailSummary {
  id: number;
  from: string;
  to: string;
  subject: string;
  receivedAt: string;
}

export interface CapturedMail extends CapturedMailSummary {
  text: string | null;
  html: string | null;
}
