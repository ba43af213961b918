import type { Sequelize } from 'sequelize';
import { Workshop } from './workshop.model.js';
import { User } from './user.model.js';
import { Customer } from './customer.model.js';
import { Aircraft } from './aircraft.model.js';
import { Job } from './job.model.js';
import { AuditEvent } from './audit-event.model.js';
import { OneTimeToken } from './one-time-token.model.js';
import { Supplier } from './supplier.model.js';
import { Part } from './part.model.js';
import { JobTemplate } from './job-template.model.js';
import { Estimate } from './estimate.model.js';
import { EstimateLine } from './estimate-line.model.js';
import { AccessTask } from './access-task.model.js';
import { JobChecklistItem } from './job-checklist-item.model.js';
import { Finding } from './finding.model.js';
import { TimeLog } from './time-log.model.js';
import { ApprovalRequest } from './approval-request.model.js';
import { FindingPhoto } from './finding-photo.model.js';
import { PaymentEvent } from './payment-event.model.js';
import { DepositRequest } from './deposit-request.model.js';
import { Payment } from './payment.model.js';
import { Refund } from './refund.model.js';
import { Invoice } from './invoice.model.js';
import { CreditNote } from './credit-note.model.js';

let bound: Sequelize | null = null;

/** Models are bound once per process; every association is declared here and nowhere else. */
export function initModels(sequelize: Sequelize): void {
  if (bound === sequelize) return;
  if (bound) throw new Error('Models are already bound to another database connection.');
  for (const m of [Workshop, User, Customer, Aircraft, Job, AuditEvent, OneTimeToken]) m.initModel(sequelize);
  for (const m of [Supplier, Part, JobTemplate, Estimate, EstimateLine, AccessTask, JobChecklistItem, Finding, TimeLog, ApprovalRequest, FindingPhoto, PaymentEvent]) m.initModel(sequelize);
  for (const m of [DepositRequest, Payment, Refund, Invoice, CreditNote]) m.initModel(sequelize);

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
  Part.belongsTo(Supplier, { foreignKey: 'supplierId', as: 'supplier' });
  Job.hasOne(Estimate, { foreignKey: 'jobId', as: 'estimate' });
  JobChecklistItem.belongsTo(User, { foreignKey: 'recordedBy', as: 'recorder' });
  Finding.belongsTo(User, { foreignKey: 'raisedBy', as: 'raiser' });
  Finding.belongsTo(User, { foreignKey: 'rectifiedBy', as: 'rectifier' });
  TimeLog.belongsTo(User, { foreignKey: 'userId', as: 'user' });
  Finding.hasMany(FindingPhoto, { foreignKey: 'findingId', as: 'photos' });
  FindingPhoto.belongsTo(Finding, { foreignKey: 'findingId', as: 'finding' });
  FindingPhoto.belongsTo(User, { foreignKey: 'uploadedBy', as: 'uploader' });
  Job.hasMany(DepositRequest, { foreignKey: 'jobId', as: 'depositRequests' });
  Job.hasMany(Payment, { foreignKey: 'jobId', as: 'payments' });
  Job.hasOne(Invoice, { foreignKey: 'jobId', as: 'invoice' });
  DepositRequest.hasMany(Payment, { foreignKey: 'depositRequestId', as: 'payments' });
  Payment.belongsTo(DepositRequest, { foreignKey: 'depositRequestId', as: 'depositRequest' });
  Payment.belongsTo(Invoice, { foreignKey: 'invoiceId', as: 'invoice' });
  Payment.hasMany(Refund, { foreignKey: 'paymentId', as: 'refunds' });
  Refund.belongsTo(Payment, { foreignKey: 'paymentId', as: 'payment' });
  Invoice.hasMany(CreditNote, { foreignKey: 'invoiceId', as: 'creditNotes' });
  CreditNote.belongsTo(Invoice, { foreignKey: 'invoiceId', as: 'invoice' });
  bound = sequelize;
}

/**
 * Lets the models go once their connection has closed (stopParts), so the same process can bind them
 * to a new one later: the API tests start and stop one server per file in one process. Binding while
 * another live connection holds them still throws.
 */
export function releaseModels(sequelize: Sequelize): void {
  if (bound === sequelize) bound = null;
}

export function boundSequelize(): Sequelize {
  if (!bound) throw new Error('initModels() has not been called.');
  return bound;
}

export { Workshop, User, Customer, Aircraft, Job, AuditEvent, OneTimeToken, Supplier, Part, JobTemplate, Estimate, EstimateLine, AccessTask, JobChecklistItem, Finding, TimeLog, ApprovalRequest, FindingPhoto, PaymentEvent, DepositRequest, Payment, Refund, Invoice, CreditNote };
