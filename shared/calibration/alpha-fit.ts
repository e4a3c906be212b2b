/**
 * Fleet calibration, upload 2: maximum-likelihood fit of the odometry motion model's noise
 * coefficients a1..a4 (variance form) from paired odometry and reference poses, percentile
 * bootstrap intervals and standardised residuals.
 *
 * Model (Thrun, Burgard & Fox, Probabilistic Robotics, 2005, §5.4, Table 5.6, variance form as
 * in the motion engine): for each step the true increment is the odometry increment minus
 * zero-mean normal noise, so the residuals e = reference − odometry of (rot1, trans, rot2) are
 * independent normals with
 *   var(e_rot1)  = a1·rot1² + a2·trans²
 *   var(e_trans) = a3·trans² + a4·(rot1² + rot2²)
 *   var(e_rot2)  = a1·rot2² + a2·trans²
 * where rot1, trans, rot2 are the ODOMETRY increment (the sampler takes its variances from it).
 *
 * Estimator. The log-likelihood splits exactly into a part in (a1, a2) (the rot1 and rot2
 * residuals, which share a1 and a2) and a part in (a3, a4) (the trans residuals). Each part is
 * a Gaussian likelihood whose variance is LINEAR in two non-negative coefficients,
 * v_j = θ1·x1_j + θ2·x2_j. We maximise it by Fisher scoring, which for this model is
 * iteratively reweighted least squares of the squared residuals e_j² on (x1_j, x2_j) with
 * weights 1/v_j² (e² has mean v and variance 2v²: the gamma GLM with identity link of
 * P. McCullagh & J. A. Nelder, Generalized Linear Models, 2nd ed., 1989), with step-halving
 * so that every step raises the likelihood and stays inside θ > 0. The constraint θ ≥ 0 is
 * handled exactly: the maximum on each edge (θ1 = 0 or θ2 = 0) has a closed form
 * (θ = mean of e²/x over x > 0); when a scoring step heads out of θ > 0 and that edge point
 * meets the Kuhn–Tucker condition the iteration stops; the best of the interior and edge
 * candidates is kept.
 * Why this and not a derivative-free search on log a_i: scoring converges in a handful of
 * iterations (fast enough to refit hundreds of bootstrap resamples in a request), and a
 * coefficient whose maximum lies at zero is returned as exactly zero instead of a log-scale
 * search crawling towards −∞.
 *
 * Intervals: percentile bootstrap (B. Efron & R. J. Tibshirani, An Introduction to the
 * Bootstrap, 1993, ch. 13): resample the steps with replacement B times (seeded, `createRng`),
 * refit, and take the (1 − level)/2 and (1 + level)/2 quantiles of each coefficient.
 * @module
 */
import {
  createRng,
  normalizeAngle,
  odometryDelta,
  odometryVariances,
  VARIANCE_FLOOR,
  type OdometryAlphas,
  type OdometryDelta,
  type Pose,
} from '../motion/index';
import { checkHeader, readDecimal, type RowProblem } from './problems';
import type { CsvRecord, CsvRecordsOptions } from './umbmark-runs';

/** One step of paired data: the two increments and their difference. */
export interface PairedStep {
  /** Increment between consecutive odometry poses (`odometryDelta`). */
  odometry: OdometryDelta;
  /** Increment between consecutive reference poses, read the same way round as the odometry one. */
  reference: OdometryDelta;
  /** reference − odometry, angles normalised to (-pi, pi]. */
  residual: OdometryDelta;
}

/** The three noise terms of the odometry motion model. */
export type NoiseComponent = 'rot1' | 'trans' | 'rot2';

/** Fewest steps accepted for a fit. */
export const MIN_ALPHA_FIT_STEPS = 20;
/** Default number of bootstrap resamples. */
export const DEFAULT_BOOTSTRAP_RESAMPLES = 500;

/** Rotations below this (rad) are rounding noise: taken as zero in the variance covariates. */
const ANGLE_ZERO = 1e-9;
/** Residuals smaller than this (rad or m) count as none where the model predicts no noise. */
const RESIDUAL_TOLERANCE = 1e-9;
const HALF_PI = Math.PI / 2;
const LOG_TWO_PI = Math.log(2 * Math.PI);

function finitePose(p: Pose): boolean {
  return Number.isFinite(p.x) && Number.isFinite(p.y) && Number.isFinite(p.theta);
}

/**
 * Pairs the poses into steps: step k (1-based) goes from pose k−1 to pose k of both tracks.
 * The reference increment is taken with `odometryDelta` and, if needed, re-read as the
 * reverse/forward reading (rot1 ± pi, −trans, rot2 ∓ pi, the same move) closest to the
 * odometry's, so that a move near rot1 = ±pi/2 is not compared with its mirror reading.
 * Throws a RangeError when the tracks differ in length, are shorter than 2 poses, or hold a
 * non-finite number (the CSV adapter {@link pairedPosesFromCsvRecords} reports these per row).
 */
export function pairedSteps(odometry: readonly Pose[], reference: readonly Pose[]): PairedStep[] {
  if (odometry.length !== reference.length) {
    throw new RangeError(`pairedSteps: ${odometry.length} odometry poses but ${reference.length} reference poses`);
  }
  if (odometry.length < 2) throw new RangeError('pairedSteps: need at least two poses');
  const steps: PairedStep[] = [];
  for (let k = 0; k < odometry.length; k++) {
    if (!finitePose(odometry[k]) || !finitePose(reference[k])) throw new RangeError(`pairedSteps: pose ${k} is not finite`);
    if (k === 0) continue;
    const od = odometryDelta(odometry[k - 1], odometry[k]);
    let rf = odometryDelta(reference[k - 1], reference[k]);
    let dRot1 = normalizeAngle(rf.rot1 - od.rot1);
    if (Math.abs(dRot1) > HALF_PI) {
      const shift = dRot1 > 0 ? -Math.PI : Math.PI;
      rf = { rot1: rf.rot1 + shift, trans: -rf.trans, rot2: normalizeAngle(rf.rot2 - shift) };
      dRot1 = normalizeAngle(rf.rot1 - od.rot1);
    }
    steps.push({
      odometry: od,
      reference: rf,
      residual: { rot1: dRot1, trans: rf.trans - od.trans, rot2: normalizeAngle(rf.rot2 - od.rot2) },
    });
  }
  return steps;
}

/**
 * The observations of one two-coefficient part: variance θ1·x1 + θ2·x2, squared residual s,
 * and the step each came from (for the bootstrap's counts).
 */
interface Part {
  x1: Float64Array;
  x2: Float64Array;
  s: Float64Array;
  step: Int32Array;
}

/**
 * rot² for the variance covariates, with rotations below {@link ANGLE_ZERO} taken as exactly
 * zero: a straight step's rot1 comes out of atan2 as ~1e-17 rather than 0, and a covariate of
 * 1e-34 would let rounding noise of the residual dominate the fit on an edge (θ = mean e²/x).
 */
function squareOrZero(rot: number): number {
  return Math.abs(rot) < ANGLE_ZERO ? 0 : rot * rot;
}

/** Observations whose variance is structurally zero (x1 = x2 = 0) carry no information. */
function buildParts(steps: readonly PairedStep[]): { rot: Part; trans: Part; unexplained: number } {
  const rot: number[][] = [[], [], [], []];
  const trans: number[][] = [[], [], [], []];
  let unexplained = 0;
  const add = (part: number[][], x1: number, x2: number, e: number, k: number): void => {
    if (x1 === 0 && x2 === 0) {
      if (Math.abs(e) > RESIDUAL_TOLERANCE) unexplained++;
      return;
    }
    part[0].push(x1);
    part[1].push(x2);
    part[2].push(e * e);
    part[3].push(k);
  };
  steps.forEach((st, k) => {
    const r1 = squareOrZero(st.odometry.rot1);
    const t = st.odometry.trans * st.odometry.trans;
    const r2 = squareOrZero(st.odometry.rot2);
    add(rot, r1, t, st.residual.rot1, k);
    add(rot, r2, t, st.residual.rot2, k);
    add(trans, t, r1 + r2, st.residual.trans, k);
  });
  const toPart = (p: number[][]): Part => ({
    x1: Float64Array.from(p[0]),
    x2: Float64Array.from(p[1]),
    s: Float64Array.from(p[2]),
    step: Int32Array.from(p[3]),
  });
  return { rot: toPart(rot), trans: toPart(trans), unexplained };
}

/** Gaussian log-likelihood of one part, each observation weighted by its step's count. */
function partLogLik(p: Part, a: number, b: number, counts: Float64Array | null): number {
  let ll = 0;
  for (let j = 0; j < p.s.length; j++) {
    const c = counts ? counts[p.step[j]] : 1;
    if (c === 0) continue;
    const raw = a * p.x1[j] + b * p.x2[j];
    const v = raw > VARIANCE_FLOOR ? raw : VARIANCE_FLOOR;
    ll -= 0.5 * c * (LOG_TWO_PI + Math.log(v) + p.s[j] / v);
  }
  return ll;
}

/** Closed-form maximum on an edge: v = θ·x → θ = Σc·s/x / Σc over x > 0. */
function edgeEstimate(x: Float64Array, p: Part, counts: Float64Array | null): number {
  let num = 0;
  let den = 0;
  for (let j = 0; j < x.length; j++) {
    const c = counts ? counts[p.step[j]] : 1;
    if (c === 0 || x[j] <= 0) continue;
    num += (c * p.s[j]) / x[j];
    den += c;
  }
  return den > 0 ? num / den : 0;
}

/** Relative change of both coefficients below which the scoring iteration stops. */
const TOLERANCE = 1e-7;

function meanS(p: Part, counts: Float64Array | null): number {
  let num = 0;
  let den = 0;
  for (let j = 0; j < p.s.length; j++) {
    const c = counts ? counts[p.step[j]] : 1;
    num += c * p.s[j];
    den += c;
  }
  return den > 0 ? num / den : 0;
}

function meanX(x: Float64Array, p: Part, counts: Float64Array | null): number {
  let num = 0;
  let den = 0;
  for (let j = 0; j < x.length; j++) {
    const c = counts ? counts[p.step[j]] : 1;
    if (x[j] <= 0) continue;
    num += c * x[j];
    den += c;
  }
  return den > 0 ? num / den : 1;
}

/**
 * Least squares of s on (x1, x2) with weights c/v², v = a·x1 + b·x2 (weights c when a = b = 0,
 * i.e. ordinary least squares). Null when the 2×2 normal equations are (nearly) singular.
 */
function weightedLeastSquares(p: Part, counts: Float64Array | null, a: number, b: number): [number, number] | null {
  let s11 = 0;
  let s12 = 0;
  let s22 = 0;
  let r1 = 0;
  let r2 = 0;
  const ordinary = a === 0 && b === 0;
  for (let j = 0; j < p.s.length; j++) {
    const c = counts ? counts[p.step[j]] : 1;
    if (c === 0) continue;
    let w = c;
    if (!ordinary) {
      const raw = a * p.x1[j] + b * p.x2[j];
      const v = raw > VARIANCE_FLOOR ? raw : VARIANCE_FLOOR;
      w = c / (v * v);
    }
    const x1 = p.x1[j];
    const x2 = p.x2[j];
    s11 += w * x1 * x1;
    s12 += w * x1 * x2;
    s22 += w * x2 * x2;
    r1 += w * x1 * p.s[j];
    r2 += w * x2 * p.s[j];
  }
  const det = s11 * s22 - s12 * s12;
  if (!(det > 1e-12 * s11 * s22)) return null;
  return [(s22 * r1 - s12 * r2) / det, (s11 * r2 - s12 * r1) / det];
}

/**
 * Slope of the log-likelihood, at the edge point (a, b) with one of them 0, in the direction of
 * the zero coefficient: ½·Σ c·x·(s − v)/v² (the score). ≤ 0 means the edge point is a
 * constrained maximum (Kuhn–Tucker).
 */
function edgeSlope(p: Part, counts: Float64Array | null, a: number, b: number): number {
  const x = a === 0 ? p.x1 : p.x2;
  let slope = 0;
  for (let j = 0; j < p.s.length; j++) {
    const c = counts ? counts[p.step[j]] : 1;
    if (c === 0) continue;
    const raw = a * p.x1[j] + b * p.x2[j];
    const v = raw > VARIANCE_FLOOR ? raw : VARIANCE_FLOOR;
    slope += (0.5 * c * x[j] * (p.s[j] - v)) / (v * v);
  }
  return slope;
}

interface PartFit {
  a: number;
  b: number;
  logLik: number;
  /** Whether the data hold any information on each coefficient (some x > 0). */
  identifiable: [boolean, boolean];
}

/**
 * Maximum-likelihood (θ1, θ2) ≥ 0 of one part: Fisher scoring (IRLS) from the interior, plus
 * the two edge maxima; the best candidate wins. See the module comment.
 */
function fitPart(p: Part, counts: Float64Array | null): PartFit {
  let has1 = false;
  let has2 = false;
  for (let j = 0; j < p.s.length; j++) {
    const c = counts ? counts[p.step[j]] : 1;
    if (c === 0) continue;
    if (p.x1[j] > 0) has1 = true;
    if (p.x2[j] > 0) has2 = true;
  }
  const identifiable: [boolean, boolean] = [has1, has2];
  const edgeA = edgeEstimate(p.x1, p, counts);
  const edgeB = edgeEstimate(p.x2, p, counts);
  const candidates: [number, number][] = [];
  if (has1) candidates.push([edgeA, 0]);
  if (has2) candidates.push([0, edgeB]);
  if (!has1 && !has2) return { a: 0, b: 0, logLik: 0, identifiable };

  if (has1 && has2 && edgeA > 0 && edgeB > 0) {
    // Start from ordinary least squares of s on (x1, x2), nudged inside θ > 0. (The edge
    // maxima are poor starts: one observation with a tiny x, such as rot1² of a nearly
    // straight step, can make mean(s/x) enormous.)
    const ols = weightedLeastSquares(p, counts, 0, 0);
    let a = ols ? ols[0] : 0;
    let b = ols ? ols[1] : 0;
    const scale = meanS(p, counts);
    a = Math.max(a, 1e-3 * scale / meanX(p.x1, p, counts));
    b = Math.max(b, 1e-3 * scale / meanX(p.x2, p, counts));
    let ll = partLogLik(p, a, b, counts);
    for (let iter = 0; iter < 100; iter++) {
      // The scoring step: weighted least squares of s on (x1, x2) with weights 1/v².
      const next = weightedLeastSquares(p, counts, a, b);
      if (!next) break; // x1 and x2 (nearly) proportional: the edges decide
      const da = next[0] - a;
      const db = next[1] - b;
      if (Math.abs(da) <= TOLERANCE * a && Math.abs(db) <= TOLERANCE * b) break; // converged
      // The step leaves θ > 0: if the edge it heads for satisfies the Kuhn–Tucker condition
      // (the likelihood falls on moving off the edge), the maximum is on that edge: stop here
      // and let the edge candidate win. Otherwise go on with a damped step inside.
      if (next[1] <= 0 && edgeSlope(p, counts, edgeA, 0) <= 0) break;
      if (next[0] <= 0 && edgeSlope(p, counts, 0, edgeB) <= 0) break;
      let t = 1;
      let accepted = false;
      for (let h = 0; h < 30; h++, t *= 0.5) {
        const na = a + t * da;
        const nb = b + t * db;
        if (!(na > 0) || !(nb > 0)) continue;
        const nll = partLogLik(p, na, nb, counts);
        if (nll > ll) {
          a = na;
          b = nb;
          ll = nll;
          accepted = true;
          break;
        }
      }
      if (!accepted) break; // no step raises the likelihood: at the maximum to rounding
    }
    candidates.push([a, b]);
  }
  let best: PartFit = { a: 0, b: 0, logLik: -Infinity, identifiable };
  for (const [a, b] of candidates) {
    const ll = partLogLik(p, a, b, counts);
    if (ll > best.logLik) best = { a, b, logLik: ll, identifiable };
  }
  return best;
}

/** The maximum-likelihood estimate. */
export interface AlphaEstimate {
  /** a1..a4, variance form (units: rad²/rad², rad²/m², m²/m², m²/rad²). */
  alphas: OdometryAlphas;
  /** Gaussian log-likelihood of the residuals at the estimate (nats). */
  logLikelihood: number;
  /** Whether the data say anything about each coefficient (e.g. a1 needs turning steps). */
  identifiable: readonly [boolean, boolean, boolean, boolean];
  /**
   * Asymptotic standard errors from the expected (Fisher) information of each part,
   * I = ½·Σ x·xᵀ/v²; `null` for a part whose estimate lies on an edge (a coefficient at 0)
   * or whose information is singular. The bootstrap intervals are the ones to report.
   */
  standardErrors: readonly [number | null, number | null, number | null, number | null];
  /** Steps used and observations in each part (rot1 + rot2; trans). */
  steps: number;
  observations: { rotation: number; translation: number };
  /** Residuals where the model predicts no noise at all (e.g. a rot1 residual while standing). */
  unexplained: number;
}

function fisherStandardErrors(p: Part, a: number, b: number): [number | null, number | null] {
  if (!(a > 0) || !(b > 0)) return [null, null];
  let i11 = 0;
  let i12 = 0;
  let i22 = 0;
  for (let j = 0; j < p.s.length; j++) {
    const v = Math.max(a * p.x1[j] + b * p.x2[j], VARIANCE_FLOOR);
    const w = 0.5 / (v * v);
    i11 += w * p.x1[j] * p.x1[j];
    i12 += w * p.x1[j] * p.x2[j];
    i22 += w * p.x2[j] * p.x2[j];
  }
  const det = i11 * i22 - i12 * i12;
  if (!(det > 1e-12 * i11 * i22)) return [null, null];
  return [Math.sqrt(i22 / det), Math.sqrt(i11 / det)];
}

function checkSteps(steps: readonly PairedStep[]): void {
  if (steps.length < MIN_ALPHA_FIT_STEPS) {
    throw new RangeError(`fitOdometryAlphas: need at least ${MIN_ALPHA_FIT_STEPS} steps, got ${steps.length}`);
  }
}

/**
 * Maximum-likelihood a1..a4 ≥ 0 from paired steps (see the module comment for the model and
 * the estimator). Throws a RangeError for fewer than {@link MIN_ALPHA_FIT_STEPS} steps.
 */
export function fitOdometryAlphas(steps: readonly PairedStep[]): AlphaEstimate {
  checkSteps(steps);
  const parts = buildParts(steps);
  const rot = fitPart(parts.rot, null);
  const trans = fitPart(parts.trans, null);
  const [se1, se2] = fisherStandardErrors(parts.rot, rot.a, rot.b);
  const [se3, se4] = fisherStandardErrors(parts.trans, trans.a, trans.b);
  return {
    alphas: [rot.a, rot.b, trans.a, trans.b],
    logLikelihood: rot.logLik + trans.logLik,
    identifiable: [...rot.identifiable, ...trans.identifiable],
    standardErrors: [se1, se2, se3, se4],
    steps: steps.length,
    observations: { rotation: parts.rot.s.length, translation: parts.trans.s.length },
    unexplained: parts.unexplained,
  };
}

/**
 * Gaussian log-likelihood of the steps' residuals under `alphas` (nats), the function that
 * {@link fitOdometryAlphas} maximises. Observations whose model variance is structurally zero
 * are left out, as in the fit.
 */
export function odometryAlphaLogLikelihood(steps: readonly PairedStep[], alphas: OdometryAlphas): number {
  const parts = buildParts(steps);
  return partLogLik(parts.rot, alphas[0], alphas[1], null) + partLogLik(parts.trans, alphas[2], alphas[3], null);
}

/** Percentile interval of one coefficient. */
export interface AlphaInterval {
  lower: number;
  upper: number;
}

/** Options of the bootstrap. */
export interface BootstrapOptions {
  /** Number of resamples B (default {@link DEFAULT_BOOTSTRAP_RESAMPLES}). */
  resamples?: number;
  /** Seed of `createRng` (default `'alpha-fit'`), so a report can be reproduced. */
  seed?: string | number;
  /** Coverage of the intervals (default 0.95). */
  level?: number;
}

/** Bootstrap intervals of a1..a4. */
export interface AlphaIntervals {
  intervals: readonly [AlphaInterval, AlphaInterval, AlphaInterval, AlphaInterval];
  /** Bootstrap standard deviation of each coefficient. */
  standardDeviations: readonly [number, number, number, number];
  resamples: number;
  seed: string | number;
  level: number;
}

/** Quantile of sorted values by linear interpolation between order statistics (Hyndman & Fan 1996, type 7). */
function quantileSorted(sorted: Float64Array, p: number): number {
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, sorted.length - 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

/**
 * Percentile bootstrap intervals of a1..a4 (Efron & Tibshirani 1993, ch. 13): B resamples of
 * the steps with replacement (each step keeps its three residuals together), each refitted
 * with {@link fitOdometryAlphas}' estimator; the interval is the (1 − level)/2 and
 * (1 + level)/2 quantiles (type 7) of the B estimates. Deterministic for a seed.
 */
export function bootstrapOdometryAlphas(steps: readonly PairedStep[], options: BootstrapOptions = {}): AlphaIntervals {
  checkSteps(steps);
  const resamples = options.resamples ?? DEFAULT_BOOTSTRAP_RESAMPLES;
  const level = options.level ?? 0.95;
  const seed = options.seed ?? 'alpha-fit';
  if (!Number.isInteger(resamples) || resamples < 2) throw new RangeError('bootstrap: resamples must be an integer ≥ 2');
  if (!(level > 0 && level < 1)) throw new RangeError('bootstrap: level must lie between 0 and 1');
  const parts = buildParts(steps);
  const n = steps.length;
  const rng = createRng(seed);
  const counts = new Float64Array(n);
  const draws = [0, 1, 2, 3].map(() => new Float64Array(resamples));
  for (let b = 0; b < resamples; b++) {
    counts.fill(0);
    for (let i = 0; i < n; i++) counts[Math.floor(rng.uniform() * n)]++;
    const rot = fitPart(parts.rot, counts);
    const trans = fitPart(parts.trans, counts);
    draws[0][b] = rot.a;
    draws[1][b] = rot.b;
    draws[2][b] = trans.a;
    draws[3][b] = trans.b;
  }
  const lowP = (1 - level) / 2;
  const highP = (1 + level) / 2;
  const intervals = draws.map((d) => {
    const sorted = d.slice().sort();
    return { lower: quantileSorted(sorted, lowP), upper: quantileSorted(sorted, highP) };
  });
  const sds = draws.map((d) => {
    const mean = d.reduce((s, v) => s + v, 0) / d.length;
    return Math.sqrt(d.reduce((s, v) => s + (v - mean) * (v - mean), 0) / (d.length - 1));
  });
  return {
    intervals: [intervals[0], intervals[1], intervals[2], intervals[3]],
    standardDeviations: [sds[0], sds[1], sds[2], sds[3]],
    resamples,
    seed,
    level,
  };
}

/** One standardised residual, for the residual plot. */
export interface StandardisedResidual {
  /** Step index, 1-based (step k goes from pose k−1 to pose k). */
  step: number;
  component: NoiseComponent;
  /** reference − odometry (rad or m). */
  residual: number;
  /** Predicted standard deviation sqrt(var) under the alphas. */
  sd: number;
  /** residual / sd: standard normal if the model and the alphas are right. */
  z: number;
}

/**
 * Standardised residuals z = residual / sqrt(predicted variance) of every step and noise term
 * under `alphas` (variances as in `odometryVariances`, Thrun, Burgard & Fox 2005, Table 5.6).
 * Terms whose predicted variance is zero (e.g. rot1 of a turn on the spot) are left out.
 */
export function standardisedResiduals(steps: readonly PairedStep[], alphas: OdometryAlphas): StandardisedResidual[] {
  const out: StandardisedResidual[] = [];
  const comps: NoiseComponent[] = ['rot1', 'trans', 'rot2'];
  steps.forEach((st, k) => {
    // Same covariates as the fit: rounding-level rotations count as zero.
    const o = st.odometry;
    const clean = { rot1: Math.sqrt(squareOrZero(o.rot1)), trans: o.trans, rot2: Math.sqrt(squareOrZero(o.rot2)) };
    const v = odometryVariances(clean, alphas);
    comps.forEach((component, i) => {
      if (!(v[i] > 0)) return;
      const sd = Math.sqrt(v[i]);
      const residual = st.residual[component];
      out.push({ step: k + 1, component, residual, sd, z: residual / sd });
    });
  });
  return out;
}

/** What a systematic error would make a noise term's residuals follow. */
export type BiasDriver = 'constant' | 'rot1' | 'trans' | 'rot2';

/**
 * Score test for a systematic error e = κ·u in one noise term: T = Σ z_j·w_j / sqrt(Σ w_j²),
 * w_j = u_j / sd_j (u = 1 for a constant offset, else the signed odometry increment). Under the
 * zero-mean model T is standard normal.
 */
export interface BiasCheck {
  component: NoiseComponent;
  driver: BiasDriver;
  statistic: number;
}

/** |T| above this is reported (two-sided p ≈ 6e-5 per check). */
export const BIAS_STATISTIC_LIMIT = 4;

const BIAS_DRIVERS: Record<NoiseComponent, BiasDriver[]> = {
  rot1: ['constant', 'rot1', 'trans'],
  trans: ['constant', 'trans'],
  rot2: ['constant', 'rot2', 'trans'],
};

/**
 * Systematic-error checks of the standardised residuals: for each noise term a constant offset,
 * and a part proportional to the signed increment that a wrong wheelbase (rotations follow
 * rot1, rot2), a wheel-diameter ratio (rotations follow trans) or a wrong mean wheel diameter
 * (trans follows trans) would leave. Zero-mean noise cannot absorb such a part except by
 * inflating the alphas, and left and right turns would hide it from a plain mean.
 */
export function biasChecks(steps: readonly PairedStep[], residuals: readonly StandardisedResidual[]): BiasCheck[] {
  const out: BiasCheck[] = [];
  for (const component of ['rot1', 'trans', 'rot2'] as const) {
    for (const driver of BIAS_DRIVERS[component]) {
      let num = 0;
      let den = 0;
      for (const r of residuals) {
        if (r.component !== component) continue;
        const u = driver === 'constant' ? 1 : steps[r.step - 1].odometry[driver];
        const w = u / r.sd;
        num += r.z * w;
        den += w * w;
      }
      if (den > 0) out.push({ component, driver, statistic: num / Math.sqrt(den) });
    }
  }
  return out;
}

/** Mean and standard deviation of the standardised residuals of one noise term. */
export interface ResidualSummary {
  count: number;
  mean: number;
  sd: number;
}

function summarise(z: readonly number[]): ResidualSummary {
  const n = z.length;
  if (n === 0) return { count: 0, mean: 0, sd: 0 };
  const mean = z.reduce((s, v) => s + v, 0) / n;
  const sd = Math.sqrt(z.reduce((s, v) => s + (v - mean) * (v - mean), 0) / n);
  return { count: n, mean, sd };
}

/** Everything the paired-data upload reports. */
export interface AlphaFitReport extends AlphaEstimate {
  bootstrap: AlphaIntervals;
  /** Standardised residuals under the fitted alphas. */
  residuals: StandardisedResidual[];
  residualSummary: Record<NoiseComponent, ResidualSummary>;
  /** Systematic-error checks of the residuals ({@link biasChecks}). */
  biasChecks: BiasCheck[];
  /** Plain-language cautions (coefficients the data cannot pin down, a bias, unexplained residuals). */
  warnings: string[];
}

const ALPHA_NEEDS = [
  'a1 needs steps that turn',
  'a2 needs steps that move',
  'a3 needs steps that move',
  'a4 needs steps that turn',
];

/**
 * Fit, bootstrap and residuals in one call, from the two pose tracks. Warns when a coefficient
 * cannot be estimated from the data, when residuals appear where the model predicts no noise,
 * and when a systematic-error check ({@link biasChecks}) exceeds {@link BIAS_STATISTIC_LIMIT}:
 * an uncorrected Ed or Eb (or wheel size) that the zero-mean model cannot absorb: correct it
 * with the UMBmark upload first, or the alphas come out too large.
 */
export function fitDriftAlphas(
  odometry: readonly Pose[],
  reference: readonly Pose[],
  options: BootstrapOptions = {},
): AlphaFitReport {
  const steps = pairedSteps(odometry, reference);
  const estimate = fitOdometryAlphas(steps);
  const bootstrap = bootstrapOdometryAlphas(steps, options);
  const residuals = standardisedResiduals(steps, estimate.alphas);
  const by = (c: NoiseComponent): number[] => residuals.filter((r) => r.component === c).map((r) => r.z);
  const residualSummary = { rot1: summarise(by('rot1')), trans: summarise(by('trans')), rot2: summarise(by('rot2')) };
  const warnings: string[] = [];
  estimate.identifiable.forEach((ok, i) => {
    if (!ok) warnings.push(`a${i + 1} cannot be estimated from these data (${ALPHA_NEEDS[i]}); it is reported as 0.`);
  });
  if (estimate.unexplained > 0) {
    warnings.push(
      `${estimate.unexplained} residual${estimate.unexplained === 1 ? '' : 's'} where the model predicts no noise (for example the reference turning while the odometry stands still); they are left out of the fit.`,
    );
  }
  const checks = biasChecks(steps, residuals);
  const words: Record<BiasDriver, string> = {
    constant: 'are off-centre',
    rot1: 'follow the rot1 increment',
    trans: 'follow the trans increment',
    rot2: 'follow the rot2 increment',
  };
  for (const b of checks) {
    if (Math.abs(b.statistic) <= BIAS_STATISTIC_LIMIT) continue;
    warnings.push(
      `The ${b.component} residuals ${words[b.driver]} (test statistic ${b.statistic.toFixed(1)}, limit ±${BIAS_STATISTIC_LIMIT}): a systematic error that zero-mean noise cannot absorb, so the alphas come out too large; correct Ed and Eb (UMBmark upload) first.`,
    );
  }
  return { ...estimate, bootstrap, residuals, residualSummary, biasChecks: checks, warnings };
}

/** Columns of the paired-pose CSV upload (one row per time sample). */
export const PAIRED_POSE_CSV_COLUMNS = {
  required: ['odom_x', 'odom_y', 'odom_theta', 'ref_x', 'ref_y', 'ref_theta'],
  optional: ['time'],
} as const;

/** Poses read from a paired-pose CSV, and the problems found. */
export interface PairedPoseRead {
  odometry: Pose[];
  reference: Pose[];
  /** Row in the file of each pose pair. */
  rows: number[];
  problems: RowProblem[];
}

/**
 * Reads the records of a paired-pose CSV upload: columns `odom_x, odom_y, odom_theta, ref_x,
 * ref_y, ref_theta` (metres and radians, one row per time sample, in time order) and an
 * optional `time` (seconds, strictly increasing). Rows are numbered as in the file (header =
 * row 1). Any problem means no poses are returned (a gap would join two distant samples into a
 * false step). Also reported: fewer than {@link MIN_ALPHA_FIT_STEPS} + 1 rows.
 */
export function pairedPosesFromCsvRecords(records: readonly CsvRecord[], options: CsvRecordsOptions = {}): PairedPoseRead {
  const header = options.header ?? (records.length > 0 ? Object.keys(records[0]) : []);
  const empty = { odometry: [], reference: [], rows: [] };
  const headerProblems = checkHeader(header, PAIRED_POSE_CSV_COLUMNS.required, PAIRED_POSE_CSV_COLUMNS.optional);
  if (headerProblems.length > 0) return { ...empty, problems: headerProblems };
  const problems: RowProblem[] = [];
  const odometry: Pose[] = [];
  const reference: Pose[] = [];
  const rows: number[] = [];
  const units: Record<string, string> = { x: 'metres', y: 'metres', theta: 'radians' };
  let lastTime = -Infinity;
  records.forEach((record, index) => {
    const row = options.rowNumbers?.[index] ?? index + 2;
    const before = problems.length;
    const values: Record<string, number> = {};
    for (const column of PAIRED_POSE_CSV_COLUMNS.required) {
      const r = readDecimal(record[column], `${column} (${units[column.split('_')[1]]})`);
      if (r.ok) values[column] = r.value;
      else problems.push({ row, column, message: r.message });
    }
    const timeText = (record.time ?? '').trim();
    if (header.includes('time')) {
      const t = readDecimal(timeText, 'time (seconds)');
      if (!t.ok) problems.push({ row, column: 'time', message: t.message });
      else if (t.value <= lastTime) {
        problems.push({ row, column: 'time', message: `time ${t.value} s does not come after the previous row's ${lastTime} s; rows must be in time order.` });
      } else lastTime = t.value;
    }
    if (problems.length > before) return;
    odometry.push({ x: values.odom_x, y: values.odom_y, theta: values.odom_theta });
    reference.push({ x: values.ref_x, y: values.ref_y, theta: values.ref_theta });
    rows.push(row);
  });
  if (records.length < MIN_ALPHA_FIT_STEPS + 1) {
    problems.push({
      row: null,
      message: `${records.length} pose row${records.length === 1 ? '' : 's'}; a fit needs at least ${MIN_ALPHA_FIT_STEPS + 1} (${MIN_ALPHA_FIT_STEPS} steps).`,
    });
  }
  return problems.length > 0 ? { ...empty, problems } : { odometry, reference, rows, problems };
}
