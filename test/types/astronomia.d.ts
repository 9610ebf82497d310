// The parts of the `astronomia` package (Meeus's algorithms, independent of ours) that the checks use.
declare module 'astronomia' {
  export const binary: {
    meanAnomaly(year: number, T: number, P: number): number;
    position(
      a: number,
      e: number,
      i: number,
      node: number,
      omega: number,
      E: number,
    ): [number, number];
  };
  export const kepler: {
    kepler3(e: number, m: number): number;
    kepler2b(e: number, m: number, places: number): number;
  };
}
