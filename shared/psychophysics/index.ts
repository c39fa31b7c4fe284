// Psychometric fits from trial counts: pure functions, no I/O.
export { fitPsychometric, PSYCHOMETRIC_MODELS, LAPSE_MAX } from './psychometric.js';
export type { PsychometricInput, PsychometricFit, PsychometricModel } from './psychometric.js';
export { fitSimultaneity } from './simultaneity.js';
export type { SimultaneityInput, SimultaneityFit } from './simultaneity.js';
export { bootstrapFit } from './bootstrap.js';
export type { BootstrapOf, BootstrapOptions, BootstrapInterval, BootstrapResult, PsychometricBootstrap, SimultaneityBootstrap } from './bootstrap.js';
export { createRandom, binomialDraw } from './random.js';
export type { Random } from './random.js';
export { PsychophysicsInputError } from './validate.js';
