import type { Page, SupplierDto } from '@wingstage/shared';
import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { ListParams } from '@/lib/list-params';
import { supplierKeys } from './catalogue-keys';

export type SupplierListParams = Partial<ListParams> & { /** Comma-separated ids. */ ids?: string };

export const getSuppliers = (params: SupplierListParams, signal?: AbortSignal) => api.get<Page<SupplierDto>>('/suppliers', params, signal);

export const suppliersQueryOptions = (params: SupplierListParams) =>
  queryOptions({ queryKey: supplierKeys.list(params), queryFn: ({ signal }) => getSuppliers(params, signal), placeholderData: keepPreviousData });

export const ALL_SUPPLIERS: SupplierListParams = { pageSize: 100, sort: 'name', dir: 'asc' };
