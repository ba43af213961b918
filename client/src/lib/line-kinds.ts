import type { EstimateStage, LineKind } from '@wingstage/shared';

export const LINE_KIND_LABELS: Record<LineKind, string> = {
  labour: 'Labour',
  part: 'Part',
  subcontract: 'Sub-contract',
  fee: 'Fee',
};

export const STAGE_LABELS: Record<EstimateStage, string> = {
  inspection: 'Inspection scope',
  discovered: 'Discovered work',
  approved: 'Approved work',
  declined: 'Declined',
};
