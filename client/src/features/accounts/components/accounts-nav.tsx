import { NavLink } from 'react-router-dom';
import { ACCOUNTS_WORDS as W } from '../words';

/** The Accounts area's sections, including the deposits page (received and waiting), which the payments feature draws. */
export const ACCOUNTS_SECTIONS: { to: string; label: string }[] = [
  { to: '/accounts', label: W.ledger.title },
  { to: '/accounts/deposits', label: 'Deposits' },
  { to: '/accounts/payouts', label: W.payouts.title },
  { to: '/accounts/exceptions', label: W.exceptions.title },
  { to: '/accounts/aged-debt', label: W.agedDebt.title },
  { to: '/accounts/vat', label: W.vat.title },
  { to: '/accounts/weeks', label: W.weeks.title },
];

export function AccountsNav() {
  return (
    <nav aria-label="Accounts sections" className="relative mb-5 overflow-x-auto">
      <ul className="flex gap-1 border-b border-seam">
        {ACCOUNTS_SECTIONS.map((s) => (
          <li key={s.to}>
            <NavLink
              end
              to={s.to}
              className={({ isActive }) =>
                `flex min-h-10 items-center whitespace-nowrap border-b-4 px-3 font-semibold no-underline ${isActive ? 'border-harbour text-slate' : 'border-transparent text-slate-soft hover:bg-cloth-sunk'}`
              }
            >
              {s.label}
            </NavLink>
          </li>
        ))}
      </ul>
    </nav>
  );
}
