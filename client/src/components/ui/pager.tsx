import { Button } from './button';

/** Previous / next for one list, shown only when the list runs past one page. */
export function Pager({ label, page, pageSize, total, onPage }: { label: string; page: number; pageSize: number; total: number; onPage: (page: number) => void }) {
  if (total <= pageSize) return null;
  const pages = Math.ceil(total / pageSize);
  return (
    <nav className="flex flex-wrap items-center gap-2" aria-label={label}>
      <Button variant="secondary" disabled={page <= 1} onClick={() => onPage(page - 1)}>
        Previous
      </Button>
      <span className="tabular-nums">
        Page {page} of {pages} ({total.toLocaleString('en-GB')} in all)
      </span>
      <Button variant="secondary" disabled={page >= pages} onClick={() => onPage(page + 1)}>
        Next
      </Button>
    </nav>
  );
}
