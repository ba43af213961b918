import type { Sequelize } from 'sequelize';
import { Workshop } from './workshop.model.js';
import { User } from './user.model.js';
import { Customer } from './customer.model.js';
import { Aircraft } from './aircraft.model.js';
import { Job } from './job.model.js';
import { AuditEvent } from './audit-event.model.js';
import { OneTimeToken } from './one-time-token.model.js';

let bound: Sequelize | null = null;

/** Models are bound once per process; every association is declared here and nowhere else. */
export function initModels(sequelize: Sequelize): void {
  if (bound === sequelize) return;
  if (bound) throw new Error('Models are already bound to another database connection.');
  for (const m of [Workshop, User, Customer, Aircraft, Job, AuditEvent, OneTimeToken]) m.initModel(sequelize);

  Workshop.hasMany(User, { foreignKey: 'workshopId' });
  User.belongsTo(Workshop, { foreignKey: 'workshopId', as: 'workshop' });
  User.belongsTo(Customer, { foreignKey: 'customerId', as: 'customer' });
  Customer.hasMany(User, { foreignKey: 'customerId', as: 'signIns' });
  Customer.hasMany(Aircraft, { foreignKey: 'customerId', as: 'aircraft' });
  Aircraft.belongsTo(Customer, { foreignKey: 'customerId', as: 'customer' });
  Aircraft.hasMany(Job, { foreignKey: 'aircraftId', as: 'jobs' });
  Job.belongsTo(Aircraft, { foreignKey: 'aircraftId', as: 'aircraft' });
  Job.hasMany(AuditEvent, { foreignKey: 'jobId', as: 'history' });
  AuditEvent.belongsTo(User, { foreignKey: 'actorUserId', as: 'actor' });
  OneTimeToken.belongsTo(User, { foreignKey: 'userId', as: 'user' });
  bound = sequelize;
}

export function boundSequelize(): Sequelize {
  if (!bound) throw new Error('initModels() has not been called.');
  return bound;
}

export { Workshop, User, Customer, Aircraft, Job, AuditEvent, OneTimeToken };
