export * from './states.js';
export * from './roles.js';
export * from './errors.js';
export * from './schemas/common.js';
export * from './schemas/auth.js';
export * from './schemas/users.js';
export * from './schemas/customers.js';
export * from './schemas/aircraft.js';
export * from './schemas/jobs.js';
export * from './schemas/workshop.js';
export * from './schemas/catalogue.js';
export * from './schemas/templates.js';
export * from './schemas/findings.js';
export * from './schemas/estimates.js';
export * from './checklist.js';
// pricing engine (money.ts, pricing/) — exported below
export * from './money.js';
export * from './pricing/index.js';
