/** Statistics over data the study already holds; pure functions, no I/O. */
export * from './agreement.js';
export * from './acceptance.js';
export * from './calibration.js';
export * from './growth.js';
export * from './clustering.js';
