// The part of `astronomia` (Meeus's algorithms, independent of ours) that the sky checks use.
declare module 'astronomia' {
  export const parallactic: {
    /** Parallactic angle (rad) for latitude φ, declination δ and hour angle H (rad). */
    parallacticAngle(φ: number, δ: number, H: number): number;
  };
}
