import { describe, expect, it } from 'vitest';
import { EigenvalueDecomposition, Matrix } from 'ml-matrix';
import { confidenceEllipse, createRng, eigenSymmetric2 } from '../../../shared/motion/index';

describe('eigenSymmetric2', () => {
  const rng = createRng('eigen');
  const cases: number[][][] = [
    [
      [4, 1.5],
      [1.5, 1],
    ],
    [
      [1, -0.8],
      [-0.8, 2],
    ],
    [
      [0.2, 0],
      [0, 3],
    ],
    [
      [3, 0],
      [0, 0.2],
    ],
    [
      [2, 0],
      [0, 2],
    ],
    [
      [1e-6, 3e-7],
      [3e-7, 4e-6],
    ],
  ];
  for (let k = 0; k < 20; k++) {
    const a = rng.uniform() * 5;
    const c = rng.uniform() * 5;
    const b = (rng.uniform() * 2 - 1) * Math.sqrt(a * c);
    cases.push([
      [a, b],
      [b, c],
    ]);
  }

  it('matches ml-matrix EigenvalueDecomposition (values; vectors up to sign)', () => {
    // Reference: ml-matrix 6.15 EigenvalueDecomposition (JAMA's symmetric tridiagonal QL).
    for (const m of cases) {
      const ours = eigenSymmetric2(m);
      const ref = new EigenvalueDecomposition(new Matrix(m), { assumeSymmetric: true });
      const order = ref.realEigenvalues
        .map((value, index) => ({ value, index }))
        .sort((p, q) => q.value - p.value);
      const scale = Math.max(Math.abs(order[0].value), 1e-300);
      for (let j = 0; j < 2; j++) {
        expect(Math.abs(ours.values[j] - order[j].value) / scale).toBeLessThan(1e-12);
      }
      if (Math.abs(order[0].value - order[1].value) / scale < 1e-9) continue; // isotropic: any basis
      for (let j = 0; j < 2; j++) {
        const col = ref.eigenvectorMatrix.getColumn(order[j].index);
        const norm = Math.hypot(col[0], col[1]);
        const dot = (ours.vectors[j][0] * col[0] + ours.vectors[j][1] * col[1]) / norm;
        expect(Math.abs(Math.abs(dot) - 1)).toBeLessThan(1e-10);
      }
      expect(ours.angle).toBeCloseTo(Math.atan2(ours.vectors[0][1], ours.vectors[0][0]), 12);
      expect(ours.angle).toBeGreaterThan(-Math.PI / 2);
      expect(ours.angle).toBeLessThanOrEqual(Math.PI / 2);
    }
  });
});

describe('confidenceEllipse', () => {
  it('scales the semi-axes by sqrt(-2 ln(1 - p)): the 95 % ring of unit variance has radius 2.447747', () => {
    // Source: sqrt of the chi-square 2-dof 0.95 quantile 5.991465 (NIST/SEMATECH e-Handbook table).
    const e = confidenceEllipse(
      [
        [1, 0],
        [0, 1],
      ],
      0.95,
    );
    expect(e.major).toBeCloseTo(Math.sqrt(5.991465), 6);
    expect(e.minor).toBeCloseTo(Math.sqrt(5.991465), 6);
  });

  it('puts the major axis along the larger-variance eigenvector', () => {
    const e = confidenceEllipse(
      [
        [1, 0],
        [0, 9],
      ],
      0.95,
    );
    expect(e.angle).toBeCloseTo(Math.PI / 2, 12);
    expect(e.major / e.minor).toBeCloseTo(3, 12);
  });

  // Mass inside the k-sigma ellipse of a 2-D normal is 1 − exp(−k²/2): a chi-square with 2 dof
  // (e.g. Johnson & Wichern, Applied Multivariate Statistical Analysis, 2007, result 4.7).
  const masses: [number, number][] = [
    [1, 0.393469],
    [2, 0.864665],
    [3, 0.988891],
  ];
  for (const [k, mass] of masses) {
    it(`the ${k}-sigma ellipse holds ${mass} of 1e5 correlated normal samples (within 3 standard errors)`, () => {
      // Reference value: 1 − exp(−k²/2) to 6 decimals; the ellipse comes from confidenceEllipse(cov, mass).
      expect(1 - Math.exp((-k * k) / 2)).toBeCloseTo(mass, 6);
      const cov = [
        [0.09, 0.05],
        [0.05, 0.04],
      ];
      const e = confidenceEllipse(cov, mass);
      // The semi-axes are k·sqrt(eigenvalue) (to the 6 decimals of the mass).
      const lambda1 = 0.5 * (0.13 + Math.hypot(0.05, 0.1));
      expect(e.major / Math.sqrt(lambda1)).toBeCloseTo(k, 4);
      // Sample with a hand-written Cholesky factor of cov.
      const l00 = Math.sqrt(cov[0][0]);
      const l10 = cov[1][0] / l00;
      const l11 = Math.sqrt(cov[1][1] - l10 * l10);
      const rng = createRng(`ellipse-${k}`);
      const n = 100_000;
      const cs = Math.cos(e.angle);
      const sn = Math.sin(e.angle);
      let inside = 0;
      for (let i = 0; i < n; i++) {
        const a = rng.normal();
        const b = rng.normal();
        const x = l00 * a;
        const y = l10 * a + l11 * b;
        const u = (x * cs + y * sn) / e.major;
        const v = (-x * sn + y * cs) / e.minor;
        if (u * u + v * v <= 1) inside++;
      }
      const se = Math.sqrt((mass * (1 - mass)) / n);
      expect(Math.abs(inside / n - mass)).toBeLessThan(3 * se);
    });
  }

  it('a wrong orientation would be detected by the same sampling check', () => {
    // Negative control for the check above: rotate the ellipse by 90° and the 2-sigma mass drops.
    const cov = [
      [0.09, 0.05],
      [0.05, 0.04],
    ];
    const e = confidenceEllipse(cov, 0.864665);
    const cs = Math.cos(e.angle + Math.PI / 2);
    const sn = Math.sin(e.angle + Math.PI / 2);
    const rng = createRng('ellipse-control');
    const n = 20_000;
    let inside = 0;
    for (let i = 0; i < n; i++) {
      const a = rng.normal();
      const b = rng.normal();
      const x = 0.3 * a;
      const y = (0.05 / 0.3) * a + Math.sqrt(0.04 - (0.05 / 0.3) ** 2) * b;
      const u = (x * cs + y * sn) / e.major;
      const v = (-x * sn + y * cs) / e.minor;
      if (u * u + v * v <= 1) inside++;
    }
    expect(0.864665 - inside / n).toBeGreaterThan(0.1);
  });
});
