/**
 * Exact conversion constants (NIST Special Publication 811, Appendix B, and CGPM).
 * Every factor here is exact by definition unless said otherwise.
 */

/** Standard acceleration of gravity g_n [m/s²] (3rd CGPM, 1901). */
export const STANDARD_GRAVITY = 9.80665;
/** International foot [m]. */
export const FOOT = 0.3048;
/** Inch [m]. */
export const INCH = 0.0254;
/** US liquid gallon [m³] (231 in³). */
export const US_GALLON = 3.785411784e-3;
/** Imperial gallon [m³]. */
export const IMPERIAL_GALLON = 4.54609e-3;
/** Barrel for petroleum [m³] = 42 US gallons (NIST SP 811, Appendix B.8: 1.589873 E−01 m³). */
export const OIL_BARREL = 42 * US_GALLON;
/** Cubic foot [m³]. */
export const CUBIC_FOOT = FOOT * FOOT * FOOT;
/** Day [s]. */
export const DAY = 86400;
/** Metric horsepower (PS) [W] = 75 kgf·m/s = 75 × g_n W (NIST SP 811, Appendix B.8: 7.354 988 E+02 W). */
export const METRIC_HORSEPOWER = 75 * STANDARD_GRAVITY;
/** Avoirdupois pound mass [kg]. */
export const POUND_MASS = 0.45359237;
/** Pound force [N] = lb × g_n. */
export const POUND_FORCE = POUND_MASS * STANDARD_GRAVITY;
/** Mechanical horsepower [W] = 550 ft·lbf/s. */
export const HORSEPOWER = 550 * FOOT * POUND_FORCE;
/** Pound force per square inch [Pa]. */
export const PSI = POUND_FORCE / (INCH * INCH);
/** Standard atmosphere [Pa]. */
export const STANDARD_ATMOSPHERE = 101325;
/** Zero of the Celsius scale [K]. */
export const CELSIUS_ZERO = 273.15;
/**
 * Density of the reference water for specific gravity [kg/m³]: pure water at 60 °F (15.56 °C),
 * from Kell's equation (Kell 1975, J. Chem. Eng. Data 20(1)). Referring SG to 60 °F is common
 * practice in the US pump trade; it makes SG = 1 reproduce the 3960 water-horsepower constant
 * within 0.05 % and the SI constant 367.1 within 0.1 %.
 */
export const SG_REFERENCE_DENSITY = 999.014;
