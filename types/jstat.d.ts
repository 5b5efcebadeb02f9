declare module "jstat" {
  interface StudentT {
    cdf(x: number, dof: number): number;
    inv(p: number, dof: number): number;
    pdf(x: number, dof: number): number;
  }
  interface Centralf {
    cdf(x: number, df1: number, df2: number): number;
    inv(p: number, df1: number, df2: number): number;
  }
  interface Normal {
    cdf(x: number, mean: number, sd: number): number;
    inv(p: number, mean: number, sd: number): number;
  }
  interface Chisquare {
    cdf(x: number, dof: number): number;
    inv(p: number, dof: number): number;
  }
  interface Binomial {
    cdf(k: number, n: number, p: number): number;
    pdf(k: number, n: number, p: number): number;
  }
  export const jStat: {
    binomial: Binomial;
    studentt: StudentT;
    centralF: Centralf;
    normal: Normal;
    chisquare: Chisquare;
    ibeta(x: number, a: number, b: number): number;
    ibetainv(p: number, a: number, b: number): number;
    /** Lower regularised incomplete gamma P(a, x). */
    lowRegGamma(a: number, x: number): number;
    /** Moment skewness m₃/m₂^1.5 (moments divided by n). */
    skewness(values: ArrayLike<number>): number;
    /** Excess moment kurtosis m₄/m₂² − 3 (moments divided by n). */
    kurtosis(values: ArrayLike<number>): number;
  };
  const _default: { jStat: typeof jStat } & typeof jStat;
  export default _default;
}
