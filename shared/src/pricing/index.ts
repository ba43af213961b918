export * from './types.js';
export * from './vat.js';
export * from './estimate.js';
export * from './limits.js';
export * from './deposits.js';
export * from './choice.js';
export * from './deposit-policy.js';
export * from './invoice.js';
