// Minimal typing of the parts of jstat 1.9.6 this package uses (the library ships no types).
declare module 'jstat' {
  interface JStatStatic {
    normal: {
      cdf(x: number, mean: number, sd: number): number;
      inv(p: number, mean: number, sd: number): number;
    };
    studentt: {
      inv(p: number, df: number): number;
    };
    erfc(x: number): number;
  }
  const jStat: JStatStatic;
  export default jStat;
}
