/**
 * One control period of the robot's drive train: the command clamped to the robot's limits
 * (speed, reverse speed, turn rate, and their accelerations), turned into encoder ticks with the
 * nominal geometry, and the odometry pose those ticks give. Shared by the drive and by the
 * scoring's nominal pass, so both move the robot by the same rule.
 * @module
 */
import { integrateWheelTicks, wheelTicksFromCommand, type Pose, type WheelTicks } from '../motion';
import type { Robot } from '../schemas/content';
import type { Command } from './types';

export interface WheelState {
  odometry: Pose;
  v: number;
  w: number;
  remainder: WheelTicks;
}

export interface WheelStep extends WheelState {
  ticks: WheelTicks;
  moved: boolean;
}

const clamp = (x: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, x));

export function wheelStep(state: WheelState, command: Command, robot: Pick<Robot, 'limits' | 'controlPeriod' | 'wheelRadius' | 'wheelbase' | 'ticksPerRevolution'>): WheelStep {
  const dt = robot.controlPeriod;
  const lim = robot.limits;
  const v = clamp(clamp(command.v, -lim.maxReverseSpeed, lim.maxSpeed), state.v - lim.maxAcceleration * dt, state.v + lim.maxAcceleration * dt);
  const w = clamp(clamp(command.w, -lim.maxTurnRate, lim.maxTurnRate), state.w - lim.maxTurnAcceleration * dt, state.w + lim.maxTurnAcceleration * dt);
  const { ticks, remainder } = wheelTicksFromCommand(v, w, dt, robot, state.remainder);
  const moved = ticks.left !== 0 || ticks.right !== 0;
  return { odometry: moved ? integrateWheelTicks(state.odometry, ticks, robot) : state.odometry, v, w, remainder, ticks, moved };
}
