import { randomUUID } from 'node:crypto';
import type { Express } from 'express';
import { EstimateLine, type Job } from '../../src/models/index.js';
import type { Scope } from '../../src/services/scope.js';
import { makeJob, makeWorkshop, signIn, type Client, type WorkshopFixture } from '../helpers.js';

/** A fresh workshop with its manager, accounts clerk and first owner signed in, their scopes, and the owner's e-mail. */
export interface StaffClients {
  w: WorkshopFixture;
  manager: Client;
  accounts: Client;
  owner: Client;
  email: string;
  managerScope: Scope;
  accountsScope: Scope;
}

export async function staffClients(app: Express, label: string): Promise<StaffClients> {
  const w = await makeWorkshop(label);
  const [manager, accounts, owner] = await Promise.all([signIn(app, w.users.manager.email), signIn(app, w.users.accounts.email), signIn(app, w.owners[0].user.email)]);
  return {
    w,
    manager,
    accounts,
    owner,
    email: w.owners[0].customer.email!,
    managerScope: { workshopId: w.workshop.id, userId: w.users.manager.id, role: 'manager', customerId: null },
    accountsScope: { workshopId: w.workshop.id, userId: w.users.accounts.id, role: 'accounts', customerId: null },
  };
}

/** A job of the first owner, ready for release, with £100.00 of agreed inspection work at the standard rate: £120.00 with VAT. */
export async function readyJob(s: Pick<StaffClients, 'w'>): Promise<Job> {
  const job = await makeJob(s.w.workshop.id, s.w.owners[0].aircraft.id, 'ready_for_release');
  await EstimateLine.create({
    jobId: job.id, id: randomUUID(), workshopId: job.workshopId, stage: 'inspection', kind: 'fee', description: 'Yearly inspection', quantity: '1',
    labourRateCode: null, ratePerHour: null, partId: null, supplierId: null, unitCost: null, unitPrice: null, markupPercent: null, amount: '100.00',
    vatRate: 'standard', findingId: null, accessTaskId: null, discountPercent: null, sortOrder: 0,
    agreedAt: new Date('2026-11-10T10:00:00Z'), agreedHow: 'phone', agreedBy: 'Owner',
  });
  return job;
}
