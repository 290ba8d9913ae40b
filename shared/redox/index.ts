// Public surface of the redox chemistry. Pure and browser-safe: no I/O, nothing runs at import.
export * from './constants';
export * from './reference-electrodes';
export * from './nernst';
export * from './ratio';
export * from './calibration';
export * from './standards';
export * from './dosing';
