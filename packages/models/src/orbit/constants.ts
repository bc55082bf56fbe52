/**
 * Physical constants in SI units.
 *
 * Masses elsewhere in `orbit/` are expressed in nominal solar masses, i.e. through the
 * nominal mass parameters GM below, which are exact by definition; the Newtonian
 * constant G is only needed to turn such masses into kilograms.
 */

/** Nominal solar radius, m (IAU 2015 Resolution B3). */
export const SOLAR_RADIUS_M = 6.957e8;
/** Nominal solar mass parameter GM_sun, m^3 s^-2 (IAU 2015 Resolution B3). */
export const SOLAR_GM = 1.3271244e20;
/** Nominal Earth equatorial radius, m (IAU 2015 Resolution B3). */
export const EARTH_RADIUS_M = 6.3781e6;
/** Nominal terrestrial mass parameter GM_earth, m^3 s^-2 (IAU 2015 Resolution B3). */
export const EARTH_GM = 3.986004e14;
/** Nominal Jovian equatorial radius, m (IAU 2015 Resolution B3). */
export const JUPITER_RADIUS_M = 7.1492e7;
/** Nominal Jovian mass parameter GM_jup, m^3 s^-2 (IAU 2015 Resolution B3). */
export const JUPITER_GM = 1.2668653e17;
/** Astronomical unit, m (IAU 2012 Resolution B2, exact). */
export const AU_M = 149597870700;
/** Newtonian constant of gravitation, m^3 kg^-1 s^-2 (CODATA 2018 recommended value). */
export const GRAVITATIONAL_CONSTANT = 6.6743e-11;
/** Seconds per day (the day of 86400 SI seconds used for Julian dates). */
export const SECONDS_PER_DAY = 86400;

/** Nominal solar mass in kg, GM_sun / G (so it carries G's relative uncertainty, 2.2e-5). */
export const SOLAR_MASS_KG = SOLAR_GM / GRAVITATIONAL_CONSTANT;
/** Earth mass in nominal solar masses, GM_earth / GM_sun (dimensionless). */
export const EARTH_MASS_IN_SOLAR = EARTH_GM / SOLAR_GM;
/** Jupiter mass in nominal solar masses, GM_jup / GM_sun (dimensionless). */
export const JUPITER_MASS_IN_SOLAR = JUPITER_GM / SOLAR_GM;
