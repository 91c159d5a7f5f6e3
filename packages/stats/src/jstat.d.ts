// Type declarations for the part of jstat (a CommonJS package without its own types) that we use.
declare module 'jstat' {
  interface JStatStatic {
    normal: {
      cdf(x: number, mean: number, sd: number): number;
      pdf(x: number, mean: number, sd: number): number;
      inv(p: number, mean: number, sd: number): number;
    };
    studentt: {
      cdf(x: number, dof: number): number;
      inv(p: number, dof: number): number;
    };
    binomial: {
      cdf(k: number, n: number, p: number): number;
      pdf(k: number, n: number, p: number): number;
    };
    chisquare: {
      cdf(x: number, dof: number): number;
      inv(p: number, dof: number): number;
    };
    gammaln(x: number): number;
  }
  const jStat: JStatStatic;
  export = jStat;
}
