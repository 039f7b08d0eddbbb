// jstat ships without type declarations; only what the cross-checks call is declared.
declare module 'jstat' {
  interface JStatStatic {
    tukey: {
      inv(p: number, nmeans: number, dof: number): number;
      cdf(q: number, nmeans: number, dof: number): number;
    };
    normal: {
      cdf(x: number, mean: number, std: number): number;
      inv(p: number, mean: number, std: number): number;
    };
  }
  const jStat: JStatStatic;
  export default jStat;
}
