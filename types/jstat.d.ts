// jstat ships no type declarations and none are published; these cover what Scorecourt calls.
declare module 'jstat' {
  interface Distribution {
    pdf(x: number, ...parameters: number[]): number;
    cdf(x: number, ...parameters: number[]): number;
    inv(p: number, ...parameters: number[]): number;
  }
  const jStat: {
    normal: Distribution;
    studentt: Distribution;
    chisquare: Distribution;
    erf(x: number): number;
    erfc(x: number): number;
    gammaln(x: number): number;
    [name: string]: unknown;
  };
  export default jStat;
}
