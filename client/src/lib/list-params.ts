import { useCallback } from 'react';
import { useSearchParams } from 'react-router-dom';

export interface ListParams {
  q: string;
  sort: string | undefined;
  dir: 'asc' | 'desc';
  page: number;
  pageSize: number;
  [extra: string]: string | number | undefined;
}

/** List state lives in the address bar so back, reload and shared links keep the same view. */
export function readListParams(search: URLSearchParams, defaults: { sort?: string; dir?: 'asc' | 'desc'; pageSize?: number } = {}, extras: string[] = []): ListParams {
  const page = Number.parseInt(search.get('page') ?? '1', 10);
  const params: ListParams = {
    q: search.get('q') ?? '',
    sort: search.get('sort') ?? defaults.sort,
    dir: search.get('dir') === 'desc' ? 'desc' : search.get('dir') === 'asc' ? 'asc' : (defaults.dir ?? 'asc'),
    page: Number.isFinite(page) && page > 0 ? page : 1,
    pageSize: defaults.pageSize ?? 20,
  };
  for (const k of extras) {
    const v = search.get(k);
    if (v) params[k] = v;
  }
  return params;
}

export function useListParams(defaults: Parameters<typeof readListParams>[1] = {}, extras: string[] = []) {
  const [search, setSearch] = useSearchParams();
  const params = readListParams(search, defaults, extras);
  const update = useCallback(
    (patch: Record<string, string | number | undefined>) => {
      setSearch(
        (prev) => {
          const next = new URLSearchParams(prev);
          for (const [k, v] of Object.entries(patch)) {
            if (v === undefined || v === '') next.delete(k);
            else next.set(k, String(v));
          }
          // Any change other than paging starts again at page 1.
          if (!('page' in patch)) next.delete('page');
          return next;
        },
        { replace: true },
      );
    },
    [setSearch],
  );
  return [params, update] as const;
}
