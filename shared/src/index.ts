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
// pricing engine (money.ts, pricing/) — exported below
export * from './money.js';
export * from './pricing/index.js';
