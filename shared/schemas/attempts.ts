import { z } from 'zod';
import type { Pose } from '../motion';
import type { BatchResult, CallRecord, DriveState, TraceStep } from '../sim';
import { callSchema, type PublicTrial } from './content';
import { idSchema } from './fields';
import { pageQuerySchema } from './users';

const finite = (what: string) => z.number({ error: `${what} must be a number.` }).refine(Number.isFinite, `${what} must be a finite number.`);

export const ATTEMPT_MODES = ['practice', 'exam'] as const;

export const EXAM_FLEET_PROFILE_MESSAGE = 'Exams always run on the standard drift profiles.';

export const attemptCreateSchema = z
  .strictObject({
    trialId: z.string().min(1).max(64),
    mode: z.enum(ATTEMPT_MODES, { error: 'Choose practice or exam.' }),
    /** Practice on a fleet profile of the operator's organization (practice only). */
    fleetProfileId: z.uuid({ error: 'Not a fleet profile id.' }).optional(),
  })
  .refine((v) => !(v.mode === 'exam' && v.fleetProfileId), { message: EXAM_FLEET_PROFILE_MESSAGE, path: ['fleetProfileId'] });
export type AttemptCreate = z.infer<typeof attemptCreateSchema>;

export const attemptParamsSchema = z.strictObject({ id: z.uuid({ error: 'Not an attempt id.' }) });

/** Most commands one batch may carry (5 s at a 0.1 s control period). */
export const MAX_BATCH = 50;

export const stepBatchSchema = z.strictObject({
  fromSeq: z.number().int().min(0),
  commands: z
    .array(z.strictObject({ v: finite('v').refine((v) => Math.abs(v) <= 100, 'v is out of range.'), w: finite('w').refine((w) => Math.abs(w) <= 100, 'w is out of range.') }))
    .min(1, 'Send at least one command.')
    .max(MAX_BATCH, `Send at most ${MAX_BATCH} commands a batch.`),
});
export type StepBatch = z.infer<typeof stepBatchSchema>;

export const estimatePinSchema = z.strictObject({
  x: finite('x'),
  y: finite('y'),
  radius: z.number().positive('The ring needs a radius above zero.').max(50, 'The ring is at most 50 m across.'),
});

export const callAnswerSchema = z.strictObject({
  callPointId: z.string().min(1).max(64),
  call: callSchema,
  estimate: estimatePinSchema.optional(),
});
export type CallAnswer = z.infer<typeof callAnswerSchema>;

export const attemptListQuerySchema = pageQuerySchema.extend({
  sortOrder: z.enum(['asc', 'desc']).default('desc'),
  status: z.enum(['driving', 'awaiting_call', 'time_up', 'submitted', 'abandoned']).optional(),
  trialId: z.string().max(64).optional(),
  userId: idSchema.optional(),
});


export interface AttemptSummary {
  id: string;
  trialId: string;
  trialTitle: string;
  mode: (typeof ATTEMPT_MODES)[number];
  status: DriveState['status'];
  userId: number;
  userName: string;
  organizationId: number | null;
  /** The fleet profile a practice drive runs on; null for the standard drift profile. */
  fleetProfile: { id: string; name: string } | null;
  createdAt: string;
  submittedAt: string | null;
}

/** What starting an attempt returns: the public trial and where the robot believes it is. */
export interface AttemptStart {
  attempt: AttemptSummary;
  publicSeed: string;
  trial: PublicTrial;
  state: DriveState;
}

/** An attempt as GET /api/attempts/:id returns it. The truth fields appear only once it is over. */
export interface AttemptView {
  attempt: AttemptSummary;
  /** The trial as this attempt drives it (a fleet profile's robot and alphas when it has one). */
  trial: PublicTrial;
  publicSeed: string;
  state: DriveState;
  /** The odometry pose after every simulated step, passes included. */
  odometryTrail: Pose[];
  /** Where in the trail the belief restarted (re-anchoring, assisted recovery) and with what noise. */
  reanchors: { index: number; noise: { position: number; heading: number } }[];
  result?: {
    secretSeed: string;
    trace: TraceStep[];
    calls: CallRecord[];
    truePose: Pose;
    log: { entryNo: number; kind: string; request: unknown; response: unknown; createdAt: string }[];
  };
}

export type { BatchResult };
