/**
 * One drive, step by step, as the server runs it: encoder ticks from the commanded wheel motion,
 * the odometry pose from those ticks with the nominal geometry, and the true pose sampled from the
 * odometry motion model (Thrun, Burgard & Fox, Probabilistic Robotics, 2005, Table 5.6) around the
 * motion the wheels really made with the hidden systematic errors (Ed, Eb), the floor's drift
 * multiplier scaling the alphas. Deterministic: the same setup and the same commands and calls
 * give the same drive, so the server rebuilds a drive by replaying its stored log.
 * No I/O here.
 * @module
 */
import {
  createRng,
  integrateWheelTicks,
  normalizeAngle,
  sampleOdometry,
  scaleOdometryAlphas,
  type Pose,
  type Rng,
  type SystematicErrors,
  type WheelTicks,
} from '../motion';
import type { Call, CallPoint, Robot, Surface, Trial } from '../schemas/content';
import { passFollower, passSlip, passSpeed, passStepLimit } from './pass';
import type { BatchResult, CallRecord, Command, DriveEvent, DriveState, DriveStatus, EstimatePin, TraceStep } from './types';
import { wheelStep } from './wheels';
import { World } from './world';

/** Below this speed the robot counts as stopped (for docking), m/s. */
const STOPPED = 0.05;

export interface DriveSetup {
  trial: Trial;
  robot: Robot;
  surfaces: Surface[];
  /** Seeds the true motion's noise; never leaves the server before submission. */
  secretSeed: string;
}

export type DriveErrorCode = 'not_driving' | 'awaiting_call' | 'time_up' | 'not_awaiting_call' | 'wrong_call_point' | 'estimate_required' | 'no_marker_in_view';

/** A request the drive cannot take in its current state; the drive is left unchanged. */
export class DriveError extends Error {
  constructor(
    readonly code: DriveErrorCode,
    message: string,
  ) {
    super(message);
  }
}

export class DriveSim {
  readonly world: World;
  readonly trace: TraceStep[] = [];
  readonly calls: CallRecord[] = [];
  private readonly rng: Rng;
  private readonly hidden: SystematicErrors;
  private remainder: WheelTicks = { left: 0, right: 0 };
  private odometry: Pose;
  private truth: Pose;
  private v = 0;
  private w = 0;
  private status: DriveStatus = 'driving';
  private seq = 0;
  private time = 0;
  private pending: CallPoint | null = null;
  private readonly answered = new Set<string>();
  private markersInView: string[];
  private docked = false;
  private contacts = 0;
  private blocked = false;
  private distanceSinceAnchor = 0;

  constructor(readonly setup: DriveSetup) {
    const { trial, robot, surfaces } = setup;
    this.world = new World(trial, robot, surfaces);
    this.rng = createRng(setup.secretSeed);
    this.hidden = trial.hiddenErrors ?? robot.hiddenErrors;
    this.odometry = { ...trial.start, theta: normalizeAngle(trial.start.theta) };
    this.truth = { ...this.odometry };
    this.markersInView = this.world.markersInView(this.truth);
  }

  /** The public state: what the client may know. */
  state(): DriveState {
    return {
      status: this.status,
      seq: this.seq,
      time: this.time,
      odometry: { ...this.odometry },
      v: this.v,
      w: this.w,
      pendingCallPointId: this.pending?.id ?? null,
      answeredCallPoints: [...this.answered],
      markersInView: [...this.markersInView],
      docked: this.docked,
      contacts: this.contacts,
      blocked: this.blocked,
      distanceSinceAnchor: this.distanceSinceAnchor,
    };
  }

  /** The true pose now. For the server's scoring and the report after submission only. */
  truePose(): Pose {
    return { ...this.truth };
  }

  /** Applies operator commands, one per control period, until the batch ends or a call point stops the robot. */
  applyBatch(commands: readonly Command[]): BatchResult {
    if (this.status === 'awaiting_call') throw new DriveError('awaiting_call', `Make the call at "${this.pending!.label}" first.`);
    if (this.status === 'time_up') throw new DriveError('time_up', 'The time limit is reached: submit the drive.');
    if (this.status !== 'driving') throw new DriveError('not_driving', 'This drive is over.');
    const odometry: Pose[] = [];
    const events: DriveEvent[] = [];
    for (const command of commands) {
      this.advance(command, 'command', 1, false, events);
      this.seq += 1;
      odometry.push({ ...this.odometry });
      if (this.status !== 'driving') break;
      const callPoint = this.world.callPointAt(this.odometry, this.answered);
      if (callPoint) {
        this.pending = callPoint;
        this.status = 'awaiting_call';
        this.v = 0;
        this.w = 0;
        events.push({ type: 'call_point', seq: this.seq, callPointId: callPoint.id, askEstimate: callPoint.askEstimate });
        break;
      }
    }
    return { seq: this.seq, odometry, events, state: this.state() };
  }

  /** Answers the pending call point, then drives the pass (or re-anchors first, or is recovered). */
  answerCall(callPointId: string, call: Call, estimate: EstimatePin | null): BatchResult {
    const callPoint = this.pending;
    if (this.status !== 'awaiting_call' || !callPoint) throw new DriveError('not_awaiting_call', 'No call is due now.');
    if (callPoint.id !== callPointId) throw new DriveError('wrong_call_point', `The call due is for "${callPoint.label}".`);
    if (callPoint.askEstimate && !estimate) throw new DriveError('estimate_required', 'Place your estimate pin before the call.');
    const inView = this.markersInView;
    if (call === 'reanchor' && inView.length === 0) {
      throw new DriveError('no_marker_in_view', 'No anchor marker can be read from here, so the robot cannot re-anchor. Choose another call.');
    }
    this.calls.push({
      callPointId,
      call,
      estimate: callPoint.askEstimate ? estimate : null,
      traceIndex: this.trace.length,
      seq: this.seq,
      time: this.time,
      markersInView: [...inView],
      odometry: { ...this.odometry },
      truth: { ...this.truth },
    });
    const events: DriveEvent[] = [];
    const odometry: Pose[] = [];
    const { rubric } = this.setup.trial;
    const speed = passSpeed(call, this.setup.robot);
    const slip = passSlip(call);
    let assisted = false;
    if (call === 'reanchor') {
      const marker = this.nearestMarker(inView);
      this.reanchor(marker.id, marker.noise, rubric.reanchorSeconds, events);
    } else if (call === 'halt') {
      // Assisted recovery: someone walks the robot through, and it restarts well localised.
      this.reanchor(null, { position: 0, heading: 0 }, rubric.haltSeconds, events);
      assisted = true;
    }
    this.drivePass(callPoint, speed, slip, assisted, odometry, events);
    this.answered.add(callPoint.id);
    this.pending = null;
    if (this.status === 'awaiting_call') this.status = 'driving';
    this.v = 0;
    this.w = 0;
    events.push({ type: 'pass_done', seq: this.seq, callPointId: callPoint.id, call });
    return { seq: this.seq, odometry, events, state: this.state() };
  }

  /** Ends the drive (submitted or abandoned); no more steps or calls. */
  finish(status: 'submitted' | 'abandoned'): DriveState {
    if (this.status === 'submitted' || this.status === 'abandoned') throw new DriveError('not_driving', 'This drive is over.');
    this.status = status;
    return this.state();
  }

  private nearestMarker(ids: string[]) {
    const markers = ids.map((id) => this.world.marker(id)!);
    const d = (m: (typeof markers)[number]) => Math.hypot(m.x - this.truth.x, m.y - this.truth.y);
    return markers.reduce((best, m) => (d(m) < d(best) ? m : best));
  }

  private reanchor(markerId: string | null, noise: { position: number; heading: number }, seconds: number, events: DriveEvent[]) {
    this.odometry = {
      x: this.truth.x + noise.position * this.rng.normal(),
      y: this.truth.y + noise.position * this.rng.normal(),
      theta: normalizeAngle(this.truth.theta + noise.heading * this.rng.normal()),
    };
    this.time += seconds;
    this.distanceSinceAnchor = 0;
    this.trace.push({
      t: this.time,
      odometry: { ...this.odometry },
      truth: { ...this.truth },
      source: 'pass',
      reanchor: { ...noise },
    });
    events.push({ type: 'reanchored', seq: this.seq, markerId, odometry: { ...this.odometry } });
    this.checkTime(events);
  }

  private drivePass(callPoint: CallPoint, speed: number, slip: number, assisted: boolean, odometry: Pose[], events: DriveEvent[]) {
    const { robot } = this.setup;
    const follower = passFollower(callPoint.passPath, speed, robot);
    const maxSteps = passStepLimit(callPoint.passPath, speed, robot);
    for (let i = 0; i < maxSteps && this.status === 'awaiting_call'; i++) {
      const command = follower.command(this.odometry);
      if (command.arrived) break;
      const contactsBefore = this.contacts;
      this.advance(command, 'pass', slip, assisted, events);
      odometry.push({ ...this.odometry });
      if (this.contacts !== contactsBefore || this.blocked) break;
    }
  }

  /**
   * One control period. After a contact the bumper stays engaged: forward commands do nothing
   * until the operator stops or reverses, so holding the stick forward is one contact, not many.
   */
  private advance(command: Command, source: TraceStep['source'], slip: number, assisted: boolean, events: DriveEvent[]) {
    const { robot } = this.setup;
    const seq = this.seq + (source === 'command' ? 1 : 0);
    const wanted = this.blocked && command.v > 0 ? { v: 0, w: command.w } : command;
    const step = wheelStep({ odometry: this.odometry, v: this.v, w: this.w, remainder: this.remainder }, wanted, robot);
    const { moved, odometry, v, w } = step;
    let truth = this.truth;
    if (moved && assisted) {
      truth = integrateWheelTicks(this.truth, step.ticks, robot);
    } else if (moved) {
      const wheels = integrateWheelTicks(this.truth, step.ticks, robot, this.hidden);
      const multiplier = this.world.driftMultiplierAt(this.truth.x, this.truth.y) * slip;
      truth = sampleOdometry(this.truth, this.truth, wheels, scaleOdometryAlphas(robot.assumedProfile.alphas, multiplier), this.rng);
    }
    this.time += robot.controlPeriod;
    const hit = moved ? this.world.contactAt(truth) : null;
    if (hit) {
      // The bumper stops the robot where it was.
      if (!this.blocked) {
        this.contacts += 1;
        events.push({ type: 'contact', seq, obstacleId: hit });
      }
      this.blocked = true;
      this.v = 0;
      this.w = 0;
      this.remainder = { left: 0, right: 0 };
    } else {
      if (source === 'command' && command.v <= 0) this.blocked = false;
      this.distanceSinceAnchor += Math.hypot(odometry.x - this.odometry.x, odometry.y - this.odometry.y);
      this.odometry = odometry;
      this.truth = truth;
      this.v = v;
      this.w = w;
      this.remainder = step.remainder;
    }
    this.trace.push({
      t: this.time,
      odometry: { ...this.odometry },
      truth: { ...this.truth },
      source,
      ...(hit ? { contact: hit } : {}),
    });
    const inView = this.world.markersInView(this.truth);
    if (inView.join() !== this.markersInView.join()) {
      this.markersInView = inView;
      events.push({ type: 'markers', seq, inView: [...inView] });
    }
    const dock = this.setup.trial.dock;
    const atDock =
      Math.hypot(this.odometry.x - dock.pose.x, this.odometry.y - dock.pose.y) <= dock.positionTolerance &&
      Math.abs(normalizeAngle(this.odometry.theta - dock.pose.theta)) <= dock.headingTolerance &&
      Math.abs(this.v) < STOPPED;
    if (atDock && !this.docked) events.push({ type: 'dock_reached', seq });
    this.docked = atDock;
    this.checkTime(events, seq);
  }

  private checkTime(events: DriveEvent[], seq = this.seq) {
    if (this.time >= this.setup.trial.timeLimit - 1e-9 && this.status !== 'time_up') {
      this.status = 'time_up';
      events.push({ type: 'time_up', seq });
    }
  }
}
