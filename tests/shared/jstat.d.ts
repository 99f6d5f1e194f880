// Minimal types for the parts of jStat the tests use as an independent cross-check.
declare module "jstat" {
  const jStat: {
    binomial: { pdf(k: number, n: number, p: number): number; cdf(k: number, n: number, p: number): number };
    chisquare: { cdf(x: number, df: number): number };
    erfc(x: number): number;
  };
  export default jStat;
}
