/** The shape every feature's key factory follows: all → lists() → list(filters) → details() → detail(id). */
export function createQueryKeys<const Name extends string>(name: Name) {
  const all = [name] as const;
  return {
    all,
    lists: () => [...all, 'list'] as const,
    list: (filters: Record<string, unknown>) => [...all, 'list', filters] as const,
    details: () => [...all, 'detail'] as const,
    detail: (id: string) => [...all, 'detail', id] as const,
  };
}
