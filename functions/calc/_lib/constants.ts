/** Standard acceleration of gravity, m/s² (CGPM 1901; NIST SP 811 appendix B). */
export const STANDARD_GRAVITY = 9.80665;

/** Standard atmosphere at sea level, Pa (US Standard Atmosphere 1976; ISO 2533). */
export const STANDARD_ATMOSPHERE = 101325;

/** 0 °C in kelvin. */
export const ZERO_CELSIUS = 273.15;

/** Default liquid state used when a function is not told otherwise: water at 20 °C, 101.325 kPa. */
export const DEFAULT_TEMPERATURE_C = 20;
export const DEFAULT_PRESSURE_PA = STANDARD_ATMOSPHERE;
