/**
 * Approvals, by concern: links and hashes (links.ts), the snapshot (snapshot.ts), sending, revoking,
 * re-sending, replacing and expiring requests (requests.service.ts), the owner's decision and staff
 * being told (decisions.service.ts), the pre-authorised limit (pre-authorisation.service.ts), and the
 * tables reached by SQL (repository.ts). Scheduled work lives in server/src/jobs/.
 */
export { canonicalJson, sha256, snapshotHashOf } from './links.js';
export { buildSnapshot } from './snapshot.js';
export { getPreAuthorisation, putPreAuthorisation } from './pre-authorisation.service.js';
export { listRequests, replaceChangedRequests, requestDto, resendRequest, revokeRequest, sendForApproval, expireDue } from './requests.service.js';
export { getDecisionPage, markSeen, submitDecision } from './decisions.service.js';
export { decisionsToSee } from './repository.js';
