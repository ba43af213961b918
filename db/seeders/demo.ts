import type { Sequelize, Transaction } from 'sequelize';
import { JOB_STATE_LABELS, type JobState } from '../../shared/src/index.js';
import { Aircraft, AuditEvent, Customer, Job, User, Workshop } from '../../server/src/models/index.js';
import { hashPassword } from '../../server/src/lib/passwords.js';
import { DEMO_JOBS, DEMO_OWNERS, DEMO_PASSWORD, DEMO_STAFF, DEMO_WORKSHOP } from './demo-data.js';
import { seedCatalogue, seedJobWork, type SeededJob } from './demo-estimates.js';
import { seedApprovals } from './demo-approvals.js';
import { seedDemoPhotos } from './demo-photos.js';
import { seedDeposits } from './demo-deposits.js';
import type Stripe from 'stripe';
import { seedAccounts } from './demo-accounts.js';
import { seedInvoices } from './demo-invoices.js';
import { loadStorageConfig } from '../../server/src/config/config.js';
import { createPhotoStore, type PhotoStore } from '../../server/src/storage/index.js';

export async function findDemoWorkshop(t?: Transaction): Promise<Workshop | null> {
  return Workshop.findOne({ where: { vatNumber: DEMO_WORKSHOP.vatNumber, name: DEMO_WORKSHOP.name }, transaction: t });
}

export async function removeDemo(sequelize: Sequelize): Promise<boolean> {
  return sequelize.transaction(async (t) => {
    const w = await findDemoWorkshop(t);
    if (!w) return false;
    // Children first, so no two cascades touch the same row in one statement.
    for (const table of ['audit_events', 'finding_photos', 'approval_requests', 'time_logs', 'estimate_lines', 'access_tasks', 'findings', 'job_checklist_items', 'estimates', 'jobs', 'job_counters', 'aircraft', 'job_templates', 'parts', 'suppliers']) {
      await sequelize.query(`DELETE FROM ${table} WHERE workshop_id = $1`, { bind: [w.id], transaction: t });
    }
    await sequelize.query('DELETE FROM users WHERE workshop_id = $1', { bind: [w.id], transaction: t });
    await sequelize.query('DELETE FROM customers WHERE workshop_id = $1', { bind: [w.id], transaction: t });
    await sequelize.query('DELETE FROM workshops WHERE id = $1', { bind: [w.id], transaction: t });
    return true;
  });
}

const day = 86_400_000;
const isoDay = (d: Date) => d.toISOString().slice(0, 10);

/**
 * Seeds the demo workshop unless it is already there. Returns whether it seeded. Demo photos go to
 * the given store, or to the one the environment's storage settings name (as the app would use).
 */
export async function seedDemo(sequelize: Sequelize, now = new Date(), store?: PhotoStore, stripe: Stripe | null = null): Promise<boolean> {
  const photos = store ?? createPhotoStore(loadStorageConfig());
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  return sequelize.transaction(async (t) => {
    // Serialise concurrent seeders; the second one then sees the workshop and stops.
    await sequelize.query('SELECT pg_advisory_xact_lock(727412)', { transaction: t });
    const existing = await findDemoWorkshop(t);
    if (existing) {
      // A demo seeded before the catalogue existed gets its suppliers, parts and templates.
      await seedCatalogue(existing, t);
      return false;
    }
    const w = await Workshop.create({ ...DEMO_WORKSHOP }, { transaction: t });
    const staff = new Map<string, User>();
    for (const s of DEMO_STAFF) {
      staff.set(s.key, await User.create({ workshopId: w.id, email: s.email, name: s.name, role: s.role, passwordHash, customerId: null }, { transaction: t }));
    }
    const aircraftByReg = new Map<string, Aircraft>();
    for (const o of DEMO_OWNERS) {
      const c = await Customer.create({ ...o.customer, workshopId: w.id }, { transaction: t });
      await User.create({ workshopId: w.id, email: o.signIn.email, name: o.signIn.name, role: 'owner', passwordHash, customerId: c.id }, { transaction: t });
      aircraftByReg.set(o.aircraft.registration, await Aircraft.create({ ...o.aircraft, workshopId: w.id, customerId: c.id }, { transaction: t }));
    }
    let n = 0;
    const seeded: SeededJob[] = [];
    for (const j of DEMO_JOBS) {
      n += 1;
      const aircraft = aircraftByReg.get(j.aircraft)!;
      const booked = new Date(now.getTime() - j.bookedDaysAgo * day);
      const number = `J-${String(n).padStart(4, '0')}`;
      const finalState: JobState = j.path.at(-1)?.to ?? 'booked_in';
      const job = await Job.create(
        {
          workshopId: w.id, number, aircraftId: aircraft.id, title: j.title, type: j.type, state: finalState,
          bookedInOn: isoDay(booked), dueOn: j.dueInDays === null ? null : isoDay(new Date(now.getTime() + j.dueInDays * day)), notes: j.notes,
        },
        { transaction: t },
      );
      const manager = staff.get('declan')!;
      seeded.push({ job, registration: aircraft.registration, at: new Date(booked.getTime() + (now.getTime() - booked.getTime()) / (j.path.length + 2)) });
      await AuditEvent.create(
        { workshopId: w.id, jobId: job.id, actorUserId: manager.id, action: 'job.booked_in', summary: `Booked in ${aircraft.registration} as ${number}: ${j.title}`, detail: { number }, at: booked },
        { transaction: t },
      );
      // Spread the moves between booking in and now, so the history reads in order.
      let from: JobState = 'booked_in';
      for (const [i, step] of j.path.entries()) {
        const at = new Date(booked.getTime() + ((i + 1) * (now.getTime() - booked.getTime())) / (j.path.length + 1));
        await AuditEvent.create(
          {
            workshopId: w.id, jobId: job.id, actorUserId: staff.get(step.by)!.id, action: 'job.state_changed',
            summary: `${JOB_STATE_LABELS[from]} → ${JOB_STATE_LABELS[step.to]}${step.reason ? `: ${step.reason}` : ''}`,
            detail: { from, to: step.to, reason: step.reason ?? '' }, at,
          },
          { transaction: t },
        );
        from = step.to;
      }
    }
    const catalogue = await seedCatalogue(w, t);
    if (catalogue) {
      await seedJobWork(w, catalogue, seeded, staff, t);
      // Before the approval request is built, so its snapshot lists the photos the owner is shown.
      const brke = seeded.find((j) => j.registration === 'Q-BRKE' && j.job.title === '100-hour engine service');
      if (brke) await seedDemoPhotos(w, brke.job.id, staff.get('priya')!, photos, brke.at, t);
      await seedApprovals(w, seeded, staff, now, t);
      await seedDeposits(w, seeded, staff, now, t, stripe);
      await seedInvoices(w, seeded, staff, now, t);
    }
    await seedAccounts(w, seeded, staff, now, t, stripe);
    await sequelize.query('INSERT INTO job_counters (workshop_id, last_number) VALUES ($1, $2)', { bind: [w.id, n], transaction: t });
    return true;
  });
}
