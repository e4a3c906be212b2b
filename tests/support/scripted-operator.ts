/**
 * A scripted operator: follows the trial's route on the odometry pose with the pure-pursuit
 * follower, answers each call point with the call the test chooses (placing an estimate pin on
 * the odometry pose), and docks. Drives a DriveSim directly or the HTTP API through a port.
 */
import { normalizeAngle, type Pose } from '../../shared/motion';
import type { Call, CallPoint, Robot, Trial } from '../../shared/schemas';
import { PathFollower, type BatchResult, type Command, type DriveState, type EstimatePin } from '../../shared/sim';

export interface DrivePort {
  step(fromSeq: number, commands: Command[]): Promise<BatchResult> | BatchResult;
  call(callPointId: string, call: Call, estimate: EstimatePin | null): Promise<BatchResult> | BatchResult;
}

export interface ScriptOptions {
  chooseCall?: (callPoint: CallPoint, state: DriveState) => Call;
  /** Commands per batch (the same command repeated). */
  batch?: number;
  maxBatches?: number;
}

export interface ScriptResult {
  state: DriveState;
  results: BatchResult[];
  batches: number;
}

export async function driveTrial(trial: Trial, robot: Pick<Robot, 'limits'>, port: DrivePort, initial: DriveState, options: ScriptOptions = {}): Promise<ScriptResult> {
  const batch = options.batch ?? 1;
  const follower = new PathFollower(trial.route, { speed: robot.limits.maxSpeed * 0.8, maxTurnRate: robot.limits.maxTurnRate, arrival: 0.08 });
  const results: BatchResult[] = [];
  let state = initial;
  let batches = 0;
  const record = (r: BatchResult) => {
    results.push(r);
    state = r.state;
  };
  while (batches < (options.maxBatches ?? 5000)) {
    if (state.status === 'awaiting_call') {
      const callPoint = trial.callPoints.find((c) => c.id === state.pendingCallPointId)!;
      const call = options.chooseCall?.(callPoint, state) ?? 'proceed';
      const pin = { x: state.odometry.x, y: state.odometry.y, radius: 0.5 };
      record(await port.call(callPoint.id, call, callPoint.askEstimate ? pin : null));
      continue;
    }
    if (state.status !== 'driving' || state.docked) break;
    batches += 1;
    record(await port.step(state.seq, Array.from({ length: batch }, () => nextCommand(state.odometry))));
  }
  return { state, results, batches };

  function nextCommand(pose: Pose): Command {
    const c = follower.command(pose);
    if (!c.arrived) return { v: c.v, w: c.w };
    const error = normalizeAngle(trial.dock.pose.theta - pose.theta);
    if (Math.abs(error) > 0.05) return { v: 0, w: Math.max(-0.6, Math.min(0.6, 1.5 * error)) };
    return { v: 0, w: 0 };
  }
}
