// jstat ships no type declarations; only the parts Tenthwise calls are declared.
declare module "jstat" {
  interface JStatNormal {
    cdf(x: number, mean: number, std: number): number;
    pdf(x: number, mean: number, std: number): number;
    inv(p: number, mean: number, std: number): number;
  }
  const jStat: { normal: JStatNormal };
  export default jStat;
}
