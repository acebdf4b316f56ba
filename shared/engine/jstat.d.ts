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
    beta: Distribution;
    mean(values: ArrayLike<number>): number;
    /** Sample (n − 1) version when `sample` is true. */
    stdev(values: ArrayLike<number>, sample?: boolean): number;
    variance(values: ArrayLike<number>, sample?: boolean): number;
    percentile(values: ArrayLike<number>, k: number, exclusive?: boolean): number;
  }
  const jStat: JStat;
  export default jStat;
}
