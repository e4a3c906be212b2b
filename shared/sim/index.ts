/**
 * The drive simulation shared by the server (authoritative runs and replays) and the client.
 * Pure TypeScript, no I/O.
 * @module
 */
export * from './types';
export { DriveSim, DriveError, PASS_SPEED, CREEP_SLIP_FACTOR, type DriveSetup, type DriveErrorCode } from './drive';
export { World, MAP_EDGE } from './world';
export { PathFollower, type FollowCommand, type FollowOptions } from './follow';
export { footprintAt, polygonsTouch, segmentsIntersect, pathLength, boundingBox } from './geometry';
export { Belief, CLOUD_SIZE, type BeliefSnapshot } from './belief';
