import type { Page, PartDto } from '@wingstage/shared';
import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { ListParams } from '@/lib/list-params';
import { partKeys } from './catalogue-keys';

export type PartListParams = Partial<ListParams> & { supplierId?: string; active?: 'true' | 'false'; /** Comma-separated ids. */ ids?: string };

export const getParts = (params: PartListParams, signal?: AbortSignal) => api.get<Page<PartDto>>('/parts', params, signal);

export const partsQueryOptions = (params: PartListParams) =>
  queryOptions({ queryKey: partKeys.list(params), queryFn: ({ signal }) => getParts(params, signal), placeholderData: keepPreviousData });
