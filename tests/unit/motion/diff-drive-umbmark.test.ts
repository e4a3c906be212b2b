import { describe, expect, it } from 'vitest';
import {
  angleDifference,
  createRng,
  curveRadiusFromEd,
  integrateWheelTicks,
  moveOnArc,
  sampleOdometry,
  umbmarkCalibrate,
  wheelDiameterFactors,
  wheelTicksFromCommand,
  type DiffDriveRobot,
  type OdometryAlphas,
  type Point2,
  type Pose,
  type SystematicErrors,
  type WheelTicks,
} from '../../../shared/motion/index';

const robot: DiffDriveRobot = { wheelRadius: 0.1, wheelbase: 0.5, ticksPerRevolution: 4096 };
const origin: Pose = { x: 0, y: 0, theta: 0 };

describe('differential drive', () => {
  it('quantises commanded wheel motion to ticks without accumulating rounding', () => {
    const perMetre = robot.ticksPerRevolution / (2 * Math.PI * robot.wheelRadius);
    let rem: WheelTicks = { left: 0, right: 0 };
    let left = 0;
    let right = 0;
    for (let k = 1; k <= 500; k++) {
      const step = wheelTicksFromCommand(0.37, 0.21, 0.1, robot, rem);
      rem = step.remainder;
      left += step.ticks.left;
      right += step.ticks.right;
      expect(Number.isInteger(step.ticks.left) && Number.isInteger(step.ticks.right)).toBe(true);
      // Wheel travel (v ∓ w·b/2)·t, in ticks: the running total stays within half a tick.
      expect(Math.abs(left - (0.37 - 0.21 * 0.25) * 0.1 * k * perMetre)).toBeLessThanOrEqual(0.5 + 1e-9);
      expect(Math.abs(right - (0.37 + 0.21 * 0.25) * 0.1 * k * perMetre)).toBeLessThanOrEqual(0.5 + 1e-9);
    }
  });

  it('integrating the ticks of a command reproduces the commanded arc within the encoder resolution', () => {
    let rem: WheelTicks = { left: 0, right: 0 };
    let odom = origin;
    for (let k = 0; k < 300; k++) {
      const step = wheelTicksFromCommand(0.5, 0.4, 0.1, robot, rem);
      rem = step.remainder;
      odom = integrateWheelTicks(odom, step.ticks, robot);
    }
    // Constant (v, w) for 30 s is the circular arc of length v·t turning by w·t.
    const arc = moveOnArc(origin, 0.5 * 30, 0.4 * 30);
    const tick = (2 * Math.PI * robot.wheelRadius) / robot.ticksPerRevolution;
    expect(Math.hypot(odom.x - arc.x, odom.y - arc.y)).toBeLessThan(20 * tick);
    expect(Math.abs(angleDifference(odom.theta, arc.theta))).toBeLessThan(4 * tick / robot.wheelbase);
  });

  it('Ed keeps the mean diameter and sets the ratio; Eb scales the turn', () => {
    const f = wheelDiameterFactors(1.01);
    expect(f.right / f.left).toBeCloseTo(1.01, 14);
    expect((f.right + f.left) / 2).toBeCloseTo(1, 14);
    // Spin on the spot: nominal odometry says dtheta; with Eb the robot turns dtheta/Eb.
    const ticks = { left: -2000, right: 2000 };
    const nominal = integrateWheelTicks(origin, ticks, robot);
    const wide = integrateWheelTicks(origin, ticks, robot, { ed: 1, eb: 1.02 });
    expect(wide.theta).toBeCloseTo(nominal.theta / 1.02, 12);
    expect(Math.hypot(nominal.x, nominal.y)).toBeLessThan(1e-15);
  });

  it('worked figure (from memory): 0.1 % wheel-diameter mismatch on a 0.30 m track curves with R ≈ 300 m, ≈ 1.5 cm lateral error over 3 m', () => {
    // From memory, not from a checked source: Ed = 1.001 and b = 0.30 m give R = b/2·(Ed+1)/(Ed−1)
    // ≈ 300 m, and a 3 m "straight" run ends about L²/(2R) = 1.5 cm to the side.
    const track: DiffDriveRobot = { wheelRadius: 0.05, wheelbase: 0.3, ticksPerRevolution: 100_000 };
    expect(curveRadiusFromEd(1.001, 0.3)).toBeGreaterThan(299);
    expect(curveRadiusFromEd(1.001, 0.3)).toBeLessThan(301);
    let truth = origin;
    let odom = origin;
    let rem: WheelTicks = { left: 0, right: 0 };
    for (let k = 0; k < 60; k++) {
      const step = wheelTicksFromCommand(0.5, 0, 0.1, track, rem);
      rem = step.remainder;
      odom = integrateWheelTicks(odom, step.ticks, track);
      truth = integrateWheelTicks(truth, step.ticks, track, { ed: 1.001, eb: 1 });
    }
    expect(odom.y).toBe(0); // odometry believes it drove straight
    expect(odom.x).toBeCloseTo(3, 4);
    expect(truth.y).toBeGreaterThan(0.014); // curves left: the right wheel is the larger one
    expect(truth.y).toBeLessThan(0.016);
  });
});

/**
 * UMBmark bidirectional square (Borenstein & Feng 1996): the robot drives a square of side L by
 * its odometry, clockwise or counter-clockwise; the true pose comes from the same ticks through
 * the actual geometry plus random odometry noise. Returns the return-position error (true minus
 * odometry) of one run.
 */
function squareRun(dir: 1 | -1, errors: SystematicErrors, alphas: OdometryAlphas, seed: string, side = 4): Point2 {
  const rng = createRng(seed);
  let odom = origin;
  let truth = origin;
  let rem: WheelTicks = { left: 0, right: 0 };
  const dt = 0.1;
  const step = (v: number, w: number): void => {
    const t = wheelTicksFromCommand(v, w, dt, robot, rem);
    rem = t.remainder;
    odom = integrateWheelTicks(odom, t.ticks, robot);
    const systematic = integrateWheelTicks(truth, t.ticks, robot, errors);
    truth = sampleOdometry(truth, truth, systematic, alphas, rng);
  };
  for (let s = 0; s < 4; s++) {
    for (let i = 0; i < side * 25; i++) step(0.4, 0); // side at 0.4 m/s
    for (let i = 0; i < 40; i++) step(0, (dir * Math.PI) / 8); // 90° at pi/8 rad/s
  }
  return { x: truth.x - odom.x, y: truth.y - odom.y };
}

describe('UMBmark (Borenstein & Feng 1996)', () => {
  const noise: OdometryAlphas = [1e-4, 1e-6, 1e-4, 1e-6];

  it('recovers known Ed and Eb from 5 runs each way on the 4 m × 4 m square within 1 %', () => {
    const known = { ed: 1.002, eb: 1.005 };
    const cw = [0, 1, 2, 3, 4].map((k) => squareRun(-1, known, noise, `cw-${k}`));
    const ccw = [0, 1, 2, 3, 4].map((k) => squareRun(1, known, noise, `ccw-${k}`));
    // The runs differ (random noise) and the systematic error dominates.
    expect(Math.hypot(cw[0].x - cw[1].x, cw[0].y - cw[1].y)).toBeGreaterThan(1e-3);
    const r = umbmarkCalibrate(cw, ccw, 4, robot.wheelbase);
    // Published formulas (alpha, beta, R, Ed, Eb) recover both ratios within 1 %.
    expect(Math.abs(r.ed / known.ed - 1)).toBeLessThan(0.01);
    expect(Math.abs(r.eb / known.eb - 1)).toBeLessThan(0.01);
    // Stronger: the deviations from 1 themselves, to the accuracy of the first-order formulas
    // (second-order terms in alpha and beta are some % of the effect at these sizes).
    expect(Math.abs((r.ed - 1) / (known.ed - 1) - 1)).toBeLessThan(0.05);
    expect(Math.abs((r.eb - 1) / (known.eb - 1) - 1)).toBeLessThan(0.2);
    // The x- and y-based angles of the paper agree with each other.
    expect(r.alphaFromY / r.alpha).toBeGreaterThan(0.8);
    expect(r.betaFromY / r.beta).toBeGreaterThan(0.8);
    // Negative control: mixing up the two directions gives the wrong sign for Ed − 1.
    const swapped = umbmarkCalibrate(ccw, cw, 4, robot.wheelbase);
    expect(Math.sign(swapped.ed - 1)).toBe(-Math.sign(known.ed - 1));
  });

  it('recovers a pure wheel-diameter error to 1 % of Ed − 1 and a pure wheelbase error to 3 % of Eb − 1', () => {
    const still: OdometryAlphas = [0, 0, 0, 0];
    const onlyEd = umbmarkCalibrate([squareRun(-1, { ed: 0.997, eb: 1 }, still, 'a')], [squareRun(1, { ed: 0.997, eb: 1 }, still, 'b')], 4, 0.5);
    expect(Math.abs((onlyEd.ed - 1) / -0.003 - 1)).toBeLessThan(0.01);
    expect(Math.abs(onlyEd.eb - 1)).toBeLessThan(0.001);
    const onlyEb = umbmarkCalibrate([squareRun(-1, { ed: 1, eb: 0.99 }, still, 'a')], [squareRun(1, { ed: 1, eb: 0.99 }, still, 'b')], 4, 0.5);
    expect(Math.abs((onlyEb.eb - 1) / -0.01 - 1)).toBeLessThan(0.03);
    expect(Math.abs(onlyEb.ed - 1)).toBeLessThan(1e-4);
  });

  it('Ed = (R + b/2)/(R − b/2) and curveRadiusFromEd are inverses; no curve without error', () => {
    for (const ed of [0.99, 0.999, 1.001, 1.02]) {
      const r = curveRadiusFromEd(ed, 0.5);
      expect((r + 0.25) / (r - 0.25)).toBeCloseTo(ed, 12);
    }
    expect(curveRadiusFromEd(1, 0.5)).toBe(Infinity);
    const perfect = umbmarkCalibrate([{ x: 0, y: 0 }], [{ x: 0, y: 0 }], 4, 0.5);
    expect(perfect.ed).toBe(1);
    expect(perfect.eb).toBe(1);
  });
});
