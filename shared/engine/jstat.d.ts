/** The few jstat functions the engine and its tests use (jstat ships no types). */
declare module 'jstat' {
  interface Distribution {
    cdf(x: number, ...params: number[]): number;
    inv(p: number, ...params: number[]): number;
    pdf(x: number, ...params: number[]): number;
  }
  interface JStat {
    normal: Distribution;
    lognormal: Distribution;
    studentt: Distribution;
    chisquare: Distribution;
  }
  const jStat: JStat;
  export default jStat;
}
