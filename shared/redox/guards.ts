/**
 * Argument checks. Every failure is a RangeError whose message names the
 * argument and the allowed range, so a metallurgist reading it in the UI
 * (or an API client) can fix the input without reading code.
 */
import { TEMP_MAX_C, TEMP_MIN_C } from './constants';

function describe(value: unknown): string {
  if (typeof value === 'number' || typeof value === 'boolean') return String(value);
  if (typeof value === 'string') return JSON.stringify(value);
  if (value === null) return 'null';
  return typeof value;
}

function fail(name: string, allowed: string, value: unknown): never {
  throw new RangeError(`${name} must be ${allowed} (got ${describe(value)})`);
}

/** Any finite number. */
export function requireFinite(name: string, value: unknown, unit = ''): number {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    fail(name, `a finite number${unit ? ` in ${unit}` : ''}`, value);
  }
  return value;
}

/*
 * The messages are built only on failure: these guards run several times per reading on the
 * ingest hot path, where an eager template string per call was a tenth of the worker's time.
 */

/** A finite number in the closed interval [min, max]. */
export function requireInRange(name: string, value: unknown, min: number, max: number, unit = ''): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < min || value > max) {
    fail(name, `a finite number in [${min}, ${max}]${unit ? ` ${unit}` : ''}`, value);
  }
  return value;
}

/** A finite number in the half-open interval (0, max]. */
export function requirePositive(name: string, value: unknown, max = Number.MAX_VALUE, unit = ''): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0 || value > max) {
    const upper = max === Number.MAX_VALUE ? 'finite' : String(max);
    fail(name, `a finite number in (0, ${upper}]${unit ? ` ${unit}` : ''}`, value);
  }
  return value;
}

/** A finite number ≥ 0. */
export function requireNonNegative(name: string, value: unknown, unit = ''): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) {
    fail(name, `a finite number ≥ 0${unit ? ` ${unit}` : ''}`, value);
  }
  return value;
}

/** A temperature inside the range the whole module supports. */
export function requireTempC(name: string, value: unknown): number {
  return requireInRange(name, value, TEMP_MIN_C, TEMP_MAX_C, '°C');
}

/** A positive safe integer (electron count n). */
export function requirePositiveInteger(name: string, value: unknown): number {
  if (typeof value !== 'number' || !Number.isSafeInteger(value) || value < 1) {
    fail(name, 'a positive integer (1, 2, 3, …)', value);
  }
  return value;
}

/** One of a fixed set of string ids. */
export function requireOneOf<T extends string>(name: string, value: unknown, allowed: readonly T[]): T {
  if (typeof value !== 'string' || !(allowed as readonly string[]).includes(value)) {
    fail(name, `one of ${allowed.map((a) => `'${a}'`).join(', ')}`, value);
  }
  return value as T;
}
