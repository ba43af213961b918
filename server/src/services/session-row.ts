import type { SessionUser } from './dto.js';

export type SessionRow = SessionUser & { workshopName: string; currency: string; contactPhone: string; contactEmail: string; revoked: boolean };

/**
 * The session check's columns and rows: the user by primary key ($1), its workshop, and whether
 * this session ($2) was signed out. A read that folds the check into its own statement puts this
 * in a CTE (`WITH s AS (${SESSION_SQL}) …`) and hands the row to `acceptSession`.
 */
export const SESSION_SQL = `
  SELECT u.id, u.workshop_id AS "workshopId", u.email, u.name, u.role, u.active, u.customer_id AS "customerId",
         u.password_hash AS "passwordHash", u.session_epoch AS "sessionEpoch", u.created_at AS "createdAt",
         w.name AS "workshopName", w.currency,
         COALESCE(w.settings->>'contactPhone', '') AS "contactPhone", COALESCE(w.settings->>'contactEmail', '') AS "contactEmail",
         EXISTS (SELECT 1 FROM revoked_sessions r WHERE r.sid = $2) AS revoked
  FROM users u JOIN workshops w ON w.id = u.workshop_id
  WHERE u.id = $1`;

