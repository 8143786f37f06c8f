export { gini } from './gini.ts';
export { klDivergence, calibrationGap, CALIBRATION_ALPHA } from './kl.ts';
export { mean, median, medianOfSorted } from './summary.ts';
