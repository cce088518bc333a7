// jstat ships no type declarations; this covers what the tests call (a CommonJS module whose
// export is the jStat object; import it as the default export).
declare module "jstat" {
  interface JStat {
    studentt: { inv(p: number, dof: number): number; cdf(x: number, dof: number): number; pdf(x: number, dof: number): number };
    normal: { inv(p: number, mean: number, sd: number): number; cdf(x: number, mean: number, sd: number): number };
  }
  const jStat: JStat;
  export = jStat;
}
