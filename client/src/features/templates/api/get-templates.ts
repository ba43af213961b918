import type { TemplateDto, TemplateSummaryDto } from '@wingstage/shared';
import { queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import { templateKeys } from './keys';

export const getTemplates = (signal?: AbortSignal) => api.get<TemplateSummaryDto[]>('/templates', undefined, signal);
export const templatesQueryOptions = () => queryOptions({ queryKey: templateKeys.list({}), queryFn: ({ signal }) => getTemplates(signal) });

export const getTemplate = (id: string, signal?: AbortSignal) => api.get<TemplateDto>(`/templates/${id}`, undefined, signal);
export const templateQueryOptions = (id: string) => queryOptions({ queryKey: templateKeys.detail(id), queryFn: ({ signal }) => getTemplate(id, signal) });
