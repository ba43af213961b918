import type { EstimateDto, QuotePhoneAgreementInput } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { jobKeysBase } from '@/lib/job-keys';
import { estimateKeys } from './keys';

/** The owner agreed the quote on the phone: who, when, a note, against the estimate version shown. */
export function useRecordPhoneAgreement(jobId: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: QuotePhoneAgreementInput) => api.post<EstimateDto>(`/jobs/${jobId}/quote/phone-agreement`, body),
    onSuccess: (estimate) => {
      qc.setQueryData(estimateKeys.detail(jobId), estimate);
      // The job's history and its next steps change with it.
      return qc.invalidateQueries({ queryKey: jobKeysBase.detail(jobId) });
    },
  });
}
