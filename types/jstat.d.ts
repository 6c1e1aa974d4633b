// Minimal typings for the parts of jstat that revtrace uses (the package ships none).
declare module 'jstat' {
  interface Distribution {
    cdf(x: number, ...params: number[]): number;
    inv(p: number, ...params: number[]): number;
    pdf(x: number, ...params: number[]): number;
  }
  export const jStat: {
    studentt: Distribution;
    normal: Distribution;
    chisquare: Distribution;
    centralF: Distribution;
    noncentralt: Distribution;
  };
  const _default: { jStat: typeof jStat } & typeof jStat;
  export default _default;
}
