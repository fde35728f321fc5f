// jstat ships no type declarations; these cover the functions Osmia calls.
// It is a CommonJS module: `import jstat from 'jstat'` then `jstat.jStat.chisquare.inv(p, dof)`.
declare module 'jstat' {
  interface Distribution {
    pdf(x: number, ...params: number[]): number;
    cdf(x: number, ...params: number[]): number;
    inv(p: number, ...params: number[]): number;
  }
  const jstat: {
    jStat: {
      chisquare: Distribution;
      normal: Distribution;
      studentt: Distribution;
      gammafn(x: number): number;
      gammaln(x: number): number;
    };
  };
  export default jstat;
}
