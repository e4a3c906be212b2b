/**
 * Scoring of a submitted drive against the pose uncertainty: pure and deterministic.
 * @module
 */
export * from './types';
export { scoreAttempt, combine, applyAmendments, type ScoreInput, type Amendment } from './score';
export { passRisk, type PassRiskInput } from './risk';
export { gradeCall, riskBand, nearEdge, type GradeInput } from './grade';
export { scoreEstimate, MIN_ELLIPSE_AREA } from './estimate';
