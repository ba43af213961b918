import type { TemplateDto, TemplateSaveInput, TemplateUpdateInput } from '@wingstage/shared';
import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, apiRequest, isApiError } from '@/lib/api-client';
import { templateKeys } from './keys';

export const createTemplate = (body: TemplateSaveInput) => api.post<TemplateDto>('/templates', body);
export const updateTemplate = (id: string, body: TemplateUpdateInput) => apiRequest<TemplateDto>(`/templates/${id}`, { method: 'PUT', body });

export function useSaveTemplate() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (v: { id: string; body: TemplateUpdateInput } | { id: null; body: TemplateSaveInput }) =>
      v.id === null ? createTemplate(v.body) : updateTemplate(v.id, v.body),
    onSuccess: (t) => {
      qc.setQueryData(templateKeys.detail(t.id), t);
      return qc.invalidateQueries({ queryKey: templateKeys.lists() });
    },
    onError: (e, v) => {
      if (isApiError(e) && e.code === 'stale_version' && v.id) return qc.invalidateQueries({ queryKey: templateKeys.detail(v.id) });
    },
  });
}
