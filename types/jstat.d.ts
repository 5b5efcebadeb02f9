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
  export const jStat: {
    studentt: StudentT;
    centralF: Centralf;
    normal: Normal;
    chisquare: Chisquare;
    ibeta(x: number, a: number, b: number): number;
    ibetainv(p: number, a: number, b: number): number;
  };
  const _default: { jStat: typeof jStat } & typeof jStat;
  export default _default;
}
