/**
 * The drive simulation shared by the server (authoritative runs and replays) and the client.
 * Pure TypeScript, no I/O.
 * @module
 */
export * from './types';
export { DriveSim, DriveError, type DriveSetup, type DriveErrorCode } from './drive';
export { PASS_SPEED, CREEP_SLIP_FACTOR, passSpeed, passSlip, nominalPass, passStepLimit } from './pass';
export { World, MAP_EDGE } from './world';
export { PathFollower, type FollowCommand, type FollowOptions } from './follow';
export { footprintAt, polygonsTouch, segmentsIntersect, pathLength, boundingBox } from './geometry';
export { Belief, CLOUD_SIZE, type BeliefSnapshot } from './belief';
export { wheelStep, type WheelState, type WheelStep } from './wheels';
