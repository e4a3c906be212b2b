import type { Ellipse, Pose } from '../motion';
import type { Call } from '../schemas/content';
import type { EstimatePin } from '../sim';

/** Bumped whenever a change to the scoring could change a stored score. */
export const SCORING_VERSION = 'scoring-1';

export const GRADES = ['sound', 'acceptable', 'overCautious', 'risky', 'unsafe'] as const;
export type Grade = (typeof GRADES)[number];

/** Where a risk lies against the rubric's two band edges. */
export type RiskBand = 'low' | 'mid' | 'high';

export interface EstimateScore {
  pin: EstimatePin;
  /** Share of the drift cloud inside the operator's ring (target 0.95). */
  coverage: number;
  /** Area of the 95 % confidence ellipse over the area of the operator's ring, at most 1. */
  sharpness: number;
  /** min(coverage / 0.95, 1) × sharpness. */
  score: number;
}

export interface CallScore {
  callPointId: string;
  label: string;
  call: Call;
  markersInView: string[];
  /** Share of the drift cloud that touches an obstacle on the pass at pass speed, and at creep. */
  riskProceed: number;
  riskCreep: number;
  band: RiskBand;
  grade: Grade;
  points: number;
  maxPoints: number;
  /** True when a risk that decided the grade lies within the review margin of a band edge. */
  nearBandEdge: boolean;
  belief: { odometry: Pose; ring: Ellipse; covariance: number[][] };
  truth: Pose;
  estimate: EstimateScore | null;
  /** Up to 400 particles of the cloud at the call, for the report. */
  cloudSample: { x: number[]; y: number[] };
  time: number;
}

export interface OutcomeScore {
  /** Call points of the trial the drive went past without a call (labels): each a critical fault. */
  skippedCallPoints: string[];
  contacts: number;
  contactObstacles: string[];
  /** Errors of the true final pose against the dock pose. */
  dockPositionError: number;
  dockHeadingError: number;
  docked: boolean;
  dockScore: number;
  time: number;
  timeLimit: number;
  timeScore: number;
  timedOut: boolean;
}

export interface ScoreParts {
  calls: number;
  estimates: number | null;
  docking: number;
  time: number;
}

/** Position and heading standard deviation of the belief against odometry distance, for the report's chart. */
export interface UncertaintyPoint {
  distance: number;
  positionSd: number;
  headingSd: number;
}

export interface AttemptScore {
  version: string;
  calls: CallScore[];
  outcome: OutcomeScore;
  parts: ScoreParts;
  /** 0–100. */
  total: number;
  passMark: number;
  criticalFaults: string[];
  passed: boolean;
  /** Reasons to send the attempt to an assessor even when its level does not require it. */
  flags: string[];
  uncertainty: UncertaintyPoint[];
}
