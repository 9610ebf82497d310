/**
 * Physical and astronomical constants, each with its source. SI units unless the name says otherwise.
 * Every other module takes its constants from here.
 */

/** Speed of light in vacuum, m/s. Exact by the SI definition of the metre (1983). */
export const C_M_PER_S = 299_792_458;
export const C_KM_PER_S = C_M_PER_S / 1000;

/** Astronomical unit, m. Exact by IAU 2012 Resolution B2. */
export const AU_M = 149_597_870_700;
export const AU_KM = AU_M / 1000;

/** Nominal solar mass parameter GM☉, m³/s². IAU 2015 Resolution B3. */
export const GM_SUN_M3_PER_S2 = 1.3271244e20;

/** Nominal solar radius, m. IAU 2015 Resolution B3. */
export const R_SUN_M = 6.957e8;

/** Geocentric gravitational constant GM⊕, m³/s². IERS Conventions (2010), Table 1.1. */
export const GM_EARTH_M3_PER_S2 = 3.986004418e14;

/** Parsec in au: 648000/π exactly. IAU 2015 Resolution B2. */
export const PARSEC_AU = 648_000 / Math.PI;
export const PARSEC_M = PARSEC_AU * AU_M;

/** Seconds per day (SI day of 86400 s). */
export const SECONDS_PER_DAY = 86_400;

/** Julian year in days, exactly 365.25. IAU definition of the Julian year. */
export const JULIAN_YEAR_DAYS = 365.25;
export const JULIAN_YEAR_S = JULIAN_YEAR_DAYS * SECONDS_PER_DAY;

/** Light year in m: c × Julian year (IAU). */
export const LIGHT_YEAR_M = C_M_PER_S * JULIAN_YEAR_S;

/** Julian Date of the J2000.0 epoch (2000-01-01T12:00 TT). */
export const JD_J2000 = 2_451_545.0;

/** MJD = JD − 2400000.5 (Smithsonian convention, IAU 1973). */
export const MJD_OFFSET = 2_400_000.5;

/** JD of the Unix epoch 1970-01-01T00:00Z. */
export const JD_UNIX_EPOCH = 2_440_587.5;

/**
 * Besselian epoch B = 1900.0 + (JD − 2415020.31352) / 365.242198781.
 * Lieske, A&A 73, 282 (1979), eq. 7 (from memory).
 */
export const BESSELIAN_JD_1900 = 2_415_020.313_52;
export const TROPICAL_YEAR_DAYS = 365.242_198_781;

/** Milliarcseconds per radian. */
export const MAS_PER_RAD = (180 / Math.PI) * 3_600_000;
export const DEG = Math.PI / 180;
export const TWO_PI = 2 * Math.PI;
