import type { PartDto, SupplierDto, TemplateLineDto } from '@wingstage/shared';
import { useQueries } from '@tanstack/react-query';
import { partsQueryOptions } from '@/lib/catalogue-parts';
import { suppliersQueryOptions } from '@/lib/catalogue-suppliers';

/** The list endpoints answer `ids=` for at most this many records at once. */
const IDS_PER_REQUEST = 100;

function batches(ids: (string | null)[]): string[] {
  const unique = [...new Set(ids.filter((x): x is string => Boolean(x)))].sort();
  const out: string[] = [];
  for (let i = 0; i < unique.length; i += IDS_PER_REQUEST) out.push(unique.slice(i, i + IDS_PER_REQUEST).join(','));
  return out;
}

/**
 * The catalogue parts and suppliers a saved template's lines already name, fetched by id (one
 * request each for up to 100 distinct ids, whatever the catalogue's size), so the pickers open
 * showing their names. Retired parts and suppliers are included: a saved line may still name one.
 */
export function useTemplateLineRecords(lines: readonly Pick<TemplateLineDto, 'partId' | 'supplierId'>[]): { parts: PartDto[]; suppliers: SupplierDto[] } {
  const partIds = batches(lines.map((l) => l.partId));
  const supplierIds = batches(lines.map((l) => l.supplierId));
  const parts = useQueries({
    queries: partIds.map((ids) => ({ ...partsQueryOptions({ ids, pageSize: IDS_PER_REQUEST }), staleTime: 60_000 })),
    combine: (rs) => rs.flatMap((r) => r.data?.items ?? []),
  });
  const suppliers = useQueries({
    queries: supplierIds.map((ids) => ({ ...suppliersQueryOptions({ ids, pageSize: IDS_PER_REQUEST }), staleTime: 60_000 })),
    combine: (rs) => rs.flatMap((r) => r.data?.items ?? []),
  });
  return { parts, suppliers };
}
