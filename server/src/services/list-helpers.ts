import type { ListQuery } from '@wingstage/shared';

/** Sort keys a list accepts, mapped to safe SQL; anything else falls back to the default. */
export function orderFrom(q: ListQuery, allowed: Record<string, string>, fallback: string): string {
  const key = q.sort && Object.hasOwn(allowed, q.sort) ? q.sort : fallback;
  const dir = q.dir === 'desc' ? 'DESC' : 'ASC';
  return `${allowed[key]} ${dir}`;
}

export function likePattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

export function pageWindow(q: ListQuery): { limit: number; offset: number } {
  return { limit: q.pageSize, offset: (q.page - 1) * q.pageSize };
}
