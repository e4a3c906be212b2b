/**
 * Driftproof motion engine: odometry and velocity motion models, map-aware sampling,
 * differential-drive odometry with UMBmark systematic errors, covariance propagation, the
 * confidence ring and the drift cloud. Pure TypeScript (no DOM or Node APIs), deterministic for
 * a given seed. See README.md beside this file for the conventions.
 * @module
 */
export type {
  Matrix2,
  Matrix3,
  OdometryAlphas,
  OdometryDelta,
  Point2,
  Polygon,
  Pose,
  Rng,
  VelocityAlphas,
} from './types';
export { angleDifference, normalizeAngle } from './angle';
export { AleaRng, createRng } from './rng';
export { logNormalDensity, normalDensity, VARIANCE_FLOOR } from './gaussian';
export {
  odometryAlphasFromStdDevForm,
  odometryAlphasToStdDevForm,
  scaleOdometryAlphas,
  velocityAlphasFromStdDevForm,
} from './alphas';
export { moveOnArc, sinc } from './arc';
export {
  applyOdometryDelta,
  odometryDelta,
  odometryDensity,
  odometryVariances,
  sampleOdometry,
  TRANS_EPSILON,
} from './odometry-model';
export {
  sampleVelocity,
  velocityControls,
  velocityDensity,
  velocityVariances,
  type VelocityControls,
} from './velocity-model';
export { flattenPolygon, pointInFlatPolygon, pointInPolygon } from './polygon';
export { CellState, OccupancyGrid, type GridPolygons, type GridSpec } from './occupancy-grid';
export { sampleWithMap, type MapLikelihood, type WeightedPose } from './map-sampling';
export {
  odometryJacobians,
  propagateOdometryCovariance,
  type OdometryJacobians,
} from './covariance';
export { eigenSymmetric2, type Eigen2 } from './eigen';
export { confidenceEllipse, type Ellipse } from './ellipse';
export { lnGamma, regularizedGammaP } from './gamma';
export { chiSquareCdf, chiSquarePdf, chiSquareQuantile } from './chi-square';
export {
  integrateWheelTicks,
  NO_SYSTEMATIC_ERRORS,
  wheelDiameterFactors,
  wheelTicksFromCommand,
  type DiffDriveRobot,
  type SystematicErrors,
  type TickStep,
  type WheelTicks,
} from './diff-drive';
export { curveRadiusFromEd, umbmarkCalibrate, type UmbmarkResult } from './umbmark';
export { ParticleCloud } from './particle-cloud';
