import { describe, expect, it } from 'vitest';
import {
  angleDifference,
  createRng,
  sampleVelocity,
  velocityAlphasFromStdDevForm,
  velocityControls,
  velocityDensity,
  velocityVariances,
  type Pose,
  type VelocityAlphas,
} from '../../../shared/motion/index';

const alphas: VelocityAlphas = [0.01, 0.005, 0.01, 0.02, 0.005, 0.005];
const start: Pose = { x: 2, y: -1, theta: 2.8 };
const dt = 0.1;

// Literal motion_model_velocity geometry of Thrun, Burgard & Fox, Probabilistic Robotics (2005),
// Table 5.1, lines 2-7 (centre of the circle, radius, swept angle). As printed, the radius r* is
// unsigned, so this reference is valid for forward left turns, which is where we compare.
function bookControls(p: Pose, q: Pose, dtt: number): { v: number; w: number; gamma: number } {
  const mu =
    (0.5 * ((p.x - q.x) * Math.cos(p.theta) + (p.y - q.y) * Math.sin(p.theta))) /
    ((p.y - q.y) * Math.cos(p.theta) - (p.x - q.x) * Math.sin(p.theta));
  const xs = (p.x + q.x) / 2 + mu * (p.y - q.y);
  const ys = (p.y + q.y) / 2 + mu * (q.x - p.x);
  const rs = Math.sqrt((p.x - xs) ** 2 + (p.y - ys) ** 2);
  const dTheta = angleDifference(Math.atan2(q.y - ys, q.x - xs), Math.atan2(p.y - ys, p.x - xs));
  const w = dTheta / dtt;
  return { v: w * rs, w, gamma: angleDifference(q.theta, p.theta) / dtt - w };
}

describe('velocity model (Thrun, Burgard & Fox 2005, Tables 5.1 and 5.3)', () => {
  it('recovers the same controls as the printed geometry for forward left turns', () => {
    const rng = createRng('velocity-book');
    let compared = 0;
    for (let i = 0; i < 200; i++) {
      const v = 0.2 + rng.uniform();
      const w = 0.05 + 2 * rng.uniform();
      const q = sampleVelocity(start, v, w, dt, alphas, rng);
      const ours = velocityControls(q, start, dt);
      const book = bookControls(start, q, dt);
      if (book.w <= 0 || ours.v <= 0) continue;
      expect(ours.v).toBeCloseTo(book.v, 8);
      expect(ours.w).toBeCloseTo(book.w, 8);
      expect(ours.gamma).toBeCloseTo(book.gamma, 8);
      compared++;
    }
    expect(compared).toBeGreaterThan(150);
  });

  for (const [v, w] of [
    [0.6, 0.4],
    [-0.4, -0.8],
    [0.5, 0],
  ] as const) {
    it(`mean log-density of 1e5 draws equals the analytic expectation (v=${v}, w=${w})`, () => {
      // For draws of the sampler the density evaluates three normal densities at the drawn noise,
      // so E[log p] = Σ −(ln(2·pi·var_i) + 1)/2 (the negative entropy of the three normals).
      const s = velocityVariances(v, w, alphas);
      const expected = s.reduce((acc, vi) => acc - 0.5 * (Math.log(2 * Math.PI * vi) + 1), 0);
      const rng = createRng(`velocity-entropy-${v}-${w}`);
      const n = 100_000;
      let sum = 0;
      let sum2 = 0;
      let sumWrong = 0;
      const wrong = velocityAlphasFromStdDevForm(alphas); // a plausible mix-up of the two forms
      for (let i = 0; i < n; i++) {
        const q = sampleVelocity(start, v, w, dt, alphas, rng);
        const l = Math.log(velocityDensity(q, start, v, w, dt, alphas));
        sum += l;
        sum2 += l * l;
        sumWrong += Math.log(velocityDensity(q, start, v, w, dt, wrong));
      }
      const mean = sum / n;
      const se = Math.sqrt((sum2 / n - mean * mean) / n);
      expect(Math.abs(mean - expected)).toBeLessThan(4 * se);
      // Negative control: the wrong coefficient form is far off (the check can fail).
      expect(Math.abs(sumWrong / n - expected)).toBeGreaterThan(100 * se);
    });
  }

  it('the w → 0 limit equals the straight-line formula, for the sampler and the density', () => {
    const still: VelocityAlphas = [0, 0, 0, 0, 0, 0];
    const rng = createRng('straight');
    const v = 0.7;
    const line = { x: start.x + v * dt * Math.cos(start.theta), y: start.y + v * dt * Math.sin(start.theta) };
    for (const w of [1e-3, 1e-6, 1e-9, 1e-12, 0]) {
      const q = sampleVelocity(start, v, w, dt, still, rng);
      // Straight-line motion: x' = x + v·dt·cos(theta), y' = y + v·dt·sin(theta); the arc deviates
      // from it by v·dt²·w/2 sideways.
      const tol = Math.max(1e-14, v * dt * dt * w);
      expect(Math.hypot(q.x - line.x, q.y - line.y)).toBeLessThanOrEqual(tol);
    }
    // Density on the straight line: v^ = distance/dt, w^ = 0, gamma^ = 0.
    const onLine = { ...line, theta: start.theta };
    const [sv, sw, sg] = velocityVariances(v, 0, alphas);
    const straight = (1 / Math.sqrt(2 * Math.PI * sv)) * (1 / Math.sqrt(2 * Math.PI * sw)) * (1 / Math.sqrt(2 * Math.PI * sg));
    expect(velocityDensity(onLine, start, v, 0, dt, alphas) / straight).toBeCloseTo(1, 12);
    const limit = velocityDensity(onLine, start, v, 1e-9, dt, alphas);
    expect(limit / velocityDensity(onLine, start, v, 0, dt, alphas)).toBeCloseTo(1, 9);
    // The printed centre-of-circle formula divides by zero on an exactly straight move, where
    // ours is finite and equals the straight-line formula.
    const east: Pose = { x: 0, y: 0, theta: 0 };
    const ahead: Pose = { x: v * dt, y: 0, theta: 0 };
    expect(Number.isFinite(bookControls(east, ahead, dt).v)).toBe(false);
    expect(velocityControls(ahead, east, dt)).toEqual({ v: expect.closeTo(v, 14), w: 0, gamma: 0 });
  });

  it('standing still: the sampler keeps the pose and the density stays finite', () => {
    const rng = createRng('still');
    const q = sampleVelocity(start, 0, 0, dt, alphas, rng);
    expect(q).toEqual(start);
    const here = velocityDensity(start, start, 0, 0, dt, alphas);
    expect(Number.isFinite(here)).toBe(true);
    expect(here).toBeGreaterThan(0);
    expect(velocityDensity({ ...start, x: start.x + 0.01 }, start, 0, 0, dt, alphas)).toBe(0);
  });

  it('reverse moves are recovered with negative v', () => {
    const q = sampleVelocity(start, -0.5, 0.3, dt, [0, 0, 0, 0, 0, 0], createRng('r'));
    const u = velocityControls(q, start, dt);
    expect(u.v).toBeCloseTo(-0.5, 12);
    expect(u.w).toBeCloseTo(0.3, 12);
    expect(u.gamma).toBeCloseTo(0, 12);
  });

  it('is deterministic for a seed', () => {
    const a = sampleVelocity(start, 0.5, 0.2, dt, alphas, createRng('same'));
    const b = sampleVelocity(start, 0.5, 0.2, dt, alphas, createRng('same'));
    const c = sampleVelocity(start, 0.5, 0.2, dt, alphas, createRng('other'));
    expect(b).toEqual(a);
    expect(c).not.toEqual(a);
  });
});
