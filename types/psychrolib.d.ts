/** The parts of the psychrolib package (ASHRAE Handbook psychrometrics) the tests use as a reference. */
declare module 'psychrolib' {
  interface Psychrometrics {
    /** Inch-pound unit system selector. */
    readonly IP: number;
    /** SI unit system selector. */
    readonly SI: number;
    SetUnitSystem(system: number): void;
    GetUnitSystem(): number | undefined;
    /** Saturation vapour pressure over liquid water (above 0.01 °C) [Pa in SI]; temperature in °C (SI). */
    GetSatVapPres(tDryBulb: number): number;
    /** Barometric pressure of the standard atmosphere [Pa in SI] at an altitude [m in SI]. */
    GetStandardAtmPressure(altitude: number): number;
    /** Standard-atmosphere temperature [°C in SI] at an altitude [m in SI]. */
    GetStandardAtmTemperature(altitude: number): number;
  }
  const psychrolib: Psychrometrics;
  export default psychrolib;
}
