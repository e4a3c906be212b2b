import { z } from 'zod';
import type { Pose } from '../motion';
import type { AttemptScore } from '../scoring';
import { GRADES } from '../scoring/types';
import type { TraceStep } from '../sim';
import type { AttemptSummary } from './attempts';
import type { PublicTrial } from './content';
import { pageQuerySchema } from './users';

const reason = z.string({ error: 'Write the reason.' }).trim().min(10, 'Write the reason in at least 10 characters.').max(2000);

export const amendmentSchema = z.discriminatedUnion('target', [
  z.strictObject({ target: z.literal('call'), callPointId: z.string().min(1).max(64), grade: z.enum(GRADES), reason }),
  z.strictObject({ target: z.literal('contacts'), contacts: z.number().int().min(0).max(1000), reason }),
  z.strictObject({ target: z.literal('docking'), dockScore: z.number().min(0).max(1), reason }),
  z.strictObject({ target: z.literal('time'), timeScore: z.number().min(0).max(1), reason }),
]);

export const verdictSchema = z.discriminatedUnion('verdict', [
  z.strictObject({ verdict: z.literal('confirm'), reason: reason.optional() }),
  z.strictObject({ verdict: z.literal('amend'), reason: reason.optional(), amendments: z.array(amendmentSchema).min(1, 'Amend at least one thing.').max(20) }),
  z.strictObject({ verdict: z.literal('void'), reason }),
]);
export type VerdictInput = z.infer<typeof verdictSchema>;

export const REVIEW_STATUSES = ['not_required', 'awaiting', 'in_review', 'confirmed', 'amended', 'voided'] as const;
export type ReviewStatus = (typeof REVIEW_STATUSES)[number];

export const reviewQueueQuerySchema = pageQuerySchema.extend({
  status: z.enum(['open', 'awaiting', 'in_review', 'signed']).default('open'),
  trialId: z.string().max(64).optional(),
  levelId: z.string().max(64).optional(),
  flagged: z.enum(['yes', 'no']).optional(),
  /** Only attempts submitted at least this many hours ago. */
  minAgeHours: z.coerce.number().min(0).max(24 * 365).optional(),
  sortField: z.enum(['submittedAt', 'total']).default('submittedAt'),
});
export type ReviewQueueQuery = z.infer<typeof reviewQueueQuerySchema>;

export interface ReviewQueueItem {
  attemptId: string;
  trialId: string;
  trialTitle: string;
  levelIds: string[];
  operatorName: string;
  organizationName: string | null;
  mode: 'practice' | 'exam';
  submittedAt: string;
  total: number;
  passed: boolean;
  flags: string[];
  status: ReviewStatus;
  assessorId: number | null;
  assessorName: string | null;
}

export interface ReviewInfo {
  status: ReviewStatus;
  assessorId: number | null;
  assessorName: string | null;
  claimedAt: string | null;
  verdict: 'confirm' | 'amend' | 'void' | null;
  reason: string | null;
  amendments: z.infer<typeof amendmentSchema>[];
  signedAt: string | null;
}

export interface AuditEntry {
  id: number;
  action: string;
  actorName: string | null;
  reason: string | null;
  details: Record<string, unknown>;
  createdAt: string;
}

/** The attempt report: the engine's score, the result that counts, and the drive to replay. */
export interface AttemptReport {
  attempt: AttemptSummary;
  trial: PublicTrial;
  publicSeed: string;
  /** The engine's score. */
  score: AttemptScore;
  /** The result that counts once final (the amended one after an amendment); null while waiting for review. */
  finalScore: AttemptScore | null;
  finalPassed: boolean | null;
  review: ReviewInfo;
  trace: TraceStep[];
  truePose: Pose;
}
