/**
 * Driftproof fleet calibration: the computations behind an employer's fleet profile.
 *
 * - UMBmark runs → Ed, Eb, E_max,syst and the corrected wheel diameters and wheelbase, by the
 *   formulas of J. Borenstein & L. Feng, "Measurement and correction of systematic odometry
 *   errors in mobile robots", IEEE Trans. Robotics and Automation 12(6), 1996 (applied by the
 *   motion engine's `umbmarkCalibrate`).
 * - Paired odometry/reference poses → maximum-likelihood a1..a4 of the odometry motion model
 *   (variance form, Thrun, Burgard & Fox, Probabilistic Robotics, 2005, Table 5.6), percentile
 *   bootstrap intervals (Efron & Tibshirani, An Introduction to the Bootstrap, 1993) and
 *   standardised residuals.
 *
 * Pure TypeScript (no DOM or Node APIs); see README.md beside this file for units, conventions
 * and the CSV columns.
 * @module
 */
export { checkHeader, readDecimal, sortProblems, type CellNumber, type RowProblem } from './problems';
export {
  calibrateUmbmarkCsv,
  calibrateUmbmarkRuns,
  checkUmbmarkRuns,
  correctedGeometry,
  umbmarkReport,
  umbmarkRunsFromCsvRecords,
  UMBMARK_CSV_COLUMNS,
  UMBMARK_MAX_HEADING_ERROR,
  UMBMARK_OUTLIER_FACTOR,
  UMBMARK_OUTLIER_FLOOR,
  UMBMARK_RUNS_PER_DIRECTION,
  UMBMARK_SIDE_LENGTH,
  type CorrectedGeometry,
  type CsvRecord,
  type CsvRecordsOptions,
  type UmbmarkCalibration,
  type UmbmarkCheckOptions,
  type UmbmarkDirection,
  type UmbmarkHeadingCheck,
  type UmbmarkReport,
  type UmbmarkRun,
  type UmbmarkRunCheck,
} from './umbmark-runs';
export {
  bootstrapOdometryAlphas,
  DEFAULT_BOOTSTRAP_RESAMPLES,
  fitDriftAlphas,
  fitOdometryAlphas,
  MIN_ALPHA_FIT_STEPS,
  odometryAlphaLogLikelihood,
  PAIRED_POSE_CSV_COLUMNS,
  pairedPosesFromCsvRecords,
  pairedSteps,
  standardisedResiduals,
  biasChecks,
  BIAS_STATISTIC_LIMIT,
  type BiasCheck,
  type BiasDriver,
  type AlphaEstimate,
  type AlphaFitReport,
  type AlphaInterval,
  type AlphaIntervals,
  type BootstrapOptions,
  type NoiseComponent,
  type PairedPoseRead,
  type PairedStep,
  type ResidualSummary,
  type StandardisedResidual,
} from './alpha-fit';
