/**
 * Tables and slow path of the ziggurat method for standard normal draws.
 *
 * Source: G. Marsaglia & W. W. Tsang, "The Ziggurat Method for Generating Random Variables",
 * Journal of Statistical Software 5(8), 2000 (128 layers, r = 3.442619855899,
 * v = 9.91256303526217e-3; tables as in their `zigset`).
 * @module
 */

/** Right edge of the base layer (Marsaglia & Tsang 2000). */
export const ZIGGURAT_R = 3.442619855899;
const ZIGGURAT_V = 9.91256303526217e-3;

/** Acceptance thresholds on |hz| per layer (`kn` in Marsaglia & Tsang 2000). */
export const ZIG_K = new Int32Array(128);
/** Scale of hz to x per layer (`wn`). */
export const ZIG_W = new Float64Array(128);
/** Density at the layer edges (`fn`). */
export const ZIG_F = new Float64Array(128);

(function zigset(): void {
  const m1 = 2147483648.0;
  let dn = ZIGGURAT_R;
  let tn = dn;
  const q = ZIGGURAT_V / Math.exp(-0.5 * dn * dn);
  ZIG_K[0] = Math.floor((dn / q) * m1);
  ZIG_K[1] = 0;
  ZIG_W[0] = q / m1;
  ZIG_W[127] = dn / m1;
  ZIG_F[0] = 1.0;
  ZIG_F[127] = Math.exp(-0.5 * dn * dn);
  for (let i = 126; i >= 1; i--) {
    dn = Math.sqrt(-2.0 * Math.log(ZIGGURAT_V / dn + Math.exp(-0.5 * dn * dn)));
    ZIG_K[i + 1] = Math.floor((dn / tn) * m1);
    tn = dn;
    ZIG_F[i] = Math.exp(-0.5 * dn * dn);
    ZIG_W[i] = dn / m1;
  }
})();

/**
 * Slow path of the ziggurat (`nfix` in Marsaglia & Tsang 2000): the wedges and the tail.
 * `hz` is a signed 32-bit draw that failed the fast test for layer `iz`; `u` gives uniforms in
 * [0, 1) with 32-bit resolution.
 */
export function zigguratFix(hz: number, iz: number, u: () => number): number {
  for (;;) {
    let x = hz * ZIG_W[iz];
    if (iz === 0) {
      // Tail beyond r (Marsaglia 1964): exponential proposals with rejection.
      let y: number;
      do {
        x = -Math.log(1 - u()) / ZIGGURAT_R;
        y = -Math.log(1 - u());
      } while (y + y < x * x);
      return hz > 0 ? ZIGGURAT_R + x : -ZIGGURAT_R - x;
    }
    if (ZIG_F[iz] + u() * (ZIG_F[iz - 1] - ZIG_F[iz]) < Math.exp(-0.5 * x * x)) return x;
    hz = (u() * 4294967296) | 0;
    iz = hz & 127;
    if (Math.abs(hz) < ZIG_K[iz]) return hz * ZIG_W[iz];
  }
}
