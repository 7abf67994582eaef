// jstat ships no type declarations; only the parts Tenthwise calls are declared.
declare module "jstat" {
  interface JStatNormal {
    cdf(x: number, mean: number, std: number): number;
    pdf(x: number, mean: number, std: number): number;
    inv(p: number, mean: number, std: number): number;
  }
  interface JStatCentralF {
    cdf(x: number, df1: number, df2: number): number;
    inv(p: number, df1: number, df2: number): number;
  }
  interface JStatStudentT {
    cdf(x: number, dof: number): number;
    inv(p: number, dof: number): number;
  }
  interface JStatBeta {
    cdf(x: number, alpha: number, beta: number): number;
    inv(p: number, alpha: number, beta: number): number;
  }
  const jStat: {
    normal: JStatNormal;
    centralF: JStatCentralF;
    studentt: JStatStudentT;
    beta: JStatBeta;
    /** Regularized incomplete beta function I_x(a, b). */
    ibeta(x: number, a: number, b: number): number;
  };
  export default jStat;
}
