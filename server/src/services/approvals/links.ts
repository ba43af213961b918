import { createHash, createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import type { ApprovalSnapshot } from '@wingstage/shared';
import type { ApprovalRequest } from '../../models/index.js';
import type { Deps } from '../deps.js';

/** JSON with object keys sorted at every depth, so the same snapshot always hashes the same. */
export function canonicalJson(value: unknown): string {
  if (value === null || typeof value !== 'object') return JSON.stringify(value);
  if (Array.isArray(value)) return `[${value.map(canonicalJson).join(',')}]`;
  const obj = value as Record<string, unknown>;
  const keys = Object.keys(obj).filter((k) => obj[k] !== undefined).sort();
  return `{${keys.map((k) => `${JSON.stringify(k)}:${canonicalJson(obj[k])}`).join(',')}}`;
}

export const sha256 = (s: string) => createHash('sha256').update(s, 'utf8').digest('hex');

export function snapshotHashOf(snapshot: ApprovalSnapshot): string {
  return sha256(canonicalJson(snapshot));
}

/** The link token is signed with the server's secret, so a reminder can repeat the link without storing it. */
function linkToken(secret: string, requestId: string, nonce: string): string {
  return createHmac('sha256', secret).update(`approval-link:${requestId}:${nonce}`).digest('base64url');
}

const linkUrl = (deps: Deps, token: string) => `${deps.config.APP_URL.replace(/\/$/, '')}/decide/${token}`;

export function newLink(deps: Deps, requestId: string): { nonce: string; token: string; tokenHash: string; url: string } {
  const nonce = randomBytes(16).toString('hex');
  const token = linkToken(deps.config.JWT_SECRET, requestId, nonce);
  return { nonce, token, tokenHash: sha256(token), url: linkUrl(deps, token) };
}

export function linkOf(deps: Deps, r: ApprovalRequest): string {
  return linkUrl(deps, linkToken(deps.config.JWT_SECRET, r.id, r.linkNonce));
}

export function sameHash(a: string, b: string): boolean {
  return a.length === b.length && timingSafeEqual(Buffer.from(a), Buffer.from(b));
}
