import type { Pose } from '../motion';
import type { Call } from '../schemas/content';

export type DriveStatus = 'driving' | 'awaiting_call' | 'time_up' | 'submitted' | 'abandoned';

/** What the server tells the client happened during a batch or a call. Never the true pose. */
export type DriveEvent =
  | { type: 'contact'; seq: number; obstacleId: string }
  | { type: 'markers'; seq: number; inView: string[] }
  | { type: 'call_point'; seq: number; callPointId: string; askEstimate: boolean }
  | { type: 'reanchored'; seq: number; markerId: string | null; odometry: Pose }
  | { type: 'pass_done'; seq: number; callPointId: string; call: Call }
  | { type: 'dock_reached'; seq: number }
  | { type: 'time_up'; seq: number };

/** The public part of a drive's state. */
export interface DriveState {
  status: DriveStatus;
  /** The seq the next batch must start at (commands applied so far). */
  seq: number;
  /** Seconds of drive time, penalties for halts and re-anchoring included. */
  time: number;
  odometry: Pose;
  v: number;
  w: number;
  pendingCallPointId: string | null;
  answeredCallPoints: string[];
  markersInView: string[];
  docked: boolean;
  /** Contact episodes so far. */
  contacts: number;
  /** The bumper is engaged after a contact: forward commands do nothing until a stop or a reverse. */
  blocked: boolean;
  /** Odometry distance since the start or the last re-anchoring, metres. */
  distanceSinceAnchor: number;
}

/** A control command: forward speed m/s and turn rate rad/s. */
export interface Command {
  v: number;
  w: number;
}

/** The operator's guess of the true position, with the radius of its 95 % ring. */
export interface EstimatePin {
  x: number;
  y: number;
  radius: number;
}

/** One simulated control period, kept for the report and for rebuilding the belief. */
export interface TraceStep {
  /** Drive time at the end of the step. */
  t: number;
  odometry: Pose;
  truth: Pose;
  /** Why the step happened: an operator command, or a pass after a call. */
  source: 'command' | 'pass';
  /** Set when the belief restarts here (re-anchoring or assisted recovery): the position noise, m and rad. */
  reanchor?: { position: number; heading: number };
  contact?: string;
}

export interface CallRecord {
  callPointId: string;
  call: Call;
  estimate: EstimatePin | null;
  /** Trace index of the step at which the call was made. */
  traceIndex: number;
  seq: number;
  time: number;
  markersInView: string[];
  /** The odometry pose at the call (the belief's centre) and the true pose, for scoring. */
  odometry: Pose;
  truth: Pose;
}

export interface BatchResult {
  seq: number;
  odometry: Pose[];
  events: DriveEvent[];
  state: DriveState;
}
