/** The parts of jstat 1.9 (which ships no types) that the tests use. */
declare module 'jstat' {
  interface Distribution1 {
    pdf(x: number, a: number): number;
    cdf(x: number, a: number): number;
    inv(p: number, a: number): number;
  }
  interface Distribution2 {
    pdf(x: number, a: number, b: number): number;
    cdf(x: number, a: number, b: number): number;
    inv(p: number, a: number, b: number): number;
  }
  interface JStatStatic {
    normal: Distribution2;
    chisquare: Distribution1;
    gammaln(x: number): number;
    lowRegGamma(a: number, x: number): number;
  }
  const jStat: JStatStatic;
  export default jStat;
}
