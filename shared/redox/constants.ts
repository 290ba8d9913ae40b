/**
 * Physical constants and the input limits shared by every redox function.
 * Kept in one place so the guards, the UI and the tests agree on the same numbers.
 */

/** Faraday constant, C/mol. Exact since the 2019 SI redefinition (CODATA 2018). */
export const FARADAY_C_PER_MOL = 96485.33212;

/** Molar gas constant, J/(mol·K). Exact since the 2019 SI redefinition (CODATA 2018). */
export const GAS_CONSTANT_J_PER_MOL_K = 8.314462618;

/** Offset from °C to K (T = tempC + 273.15). */
export const KELVIN_OFFSET = 273.15;

/** Lowest temperature accepted, °C. Below this, aqueous leach liquors freeze. */
export const TEMP_MIN_C = -10;

/** Highest temperature accepted, °C. Pressure-leach autoclaves run up to about here. */
export const TEMP_MAX_C = 150;

/**
 * |log10 ratio| above which a computed ratio is flagged 'outside-range':
 * beyond 1:10 000 either way the minor ion is at trace level and the probe
 * no longer follows the Fe couple, so the number is not trustworthy.
 */
export const MAX_ABS_LOG10_RATIO = 4;

/**
 * Largest |ln ratio| ever returned. exp(709.8) overflows a double and
 * exp(-745) underflows to 0, so we clamp well inside to keep ratios finite and > 0.
 */
export const MAX_ABS_LN_RATIO = 700;

/**
 * Widest probe reading accepted, mV. Water is decomposed long before ±2 V,
 * so anything beyond ±5 V is a wiring or unit error, not a potential.
 */
export const ORP_LIMIT_MV = 5000;

/** Widest potential (formal or reference electrode) accepted, V vs SHE. */
export const POTENTIAL_LIMIT_V = 5;

/**
 * Widest temperature coefficient accepted, V/K. Real electrodes and couples
 * sit around ±1 mV/K; ±10 mV/K leaves room without admitting unit mistakes (mV entered as V).
 */
export const TEMP_COEFF_LIMIT_V_PER_K = 0.01;

/** Largest tolerance accepted for probe checks and uncertainty, mV. */
export const TOLERANCE_LIMIT_MV = 1000;
