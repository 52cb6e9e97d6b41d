/**
 * Plant layer: stack and rectifier sizing, shunt currents, coating comparison, costs.
 */
export * from './performance.js';
export * from './products.js';
export * from './sizing.js';
export * from './shunt.js';
export * from './coatings.js';
export * from './costs.js';
export { MoneyDecimal, money, roundMoney, capitalRecoveryFactor, annuityFactor, presentValue, type MoneyValue, type RoundingMode } from './money.js';
export { minimizeBracketed, findRootBracketed, type Minimum1D, type Root1D } from './optimize1d.js';
