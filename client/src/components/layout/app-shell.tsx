import { ROLE_LABELS, type SessionDto } from '@wingstage/shared';
import { useEffect, useRef, useState, type ReactNode } from 'react';
import { Link, NavLink, useLocation } from 'react-router-dom';
import { navFor } from '@/lib/permissions';
import { CloseIcon, MenuIcon } from '@/components/ui/icons';
import { Wordmark } from '@/components/ui/wordmark';

const navLinkClass = ({ isActive }: { isActive: boolean }) =>
  `flex min-h-11 items-center rounded-control px-3 font-semibold no-underline md:min-h-10 ${
    isActive ? 'bg-harbour text-on-harbour' : 'text-slate hover:bg-cloth-sunk'
  }`;

/** The main places for this role: the same links in the wide bar and in the phone menu. */
function NavList({ items, className }: { items: ReturnType<typeof navFor>; className: string }) {
  return (
    <ul className={className}>
      {items.map((it) => (
        <li key={it.to}>
          <NavLink to={it.to} className={navLinkClass}>
            {it.label}
          </NavLink>
        </li>
      ))}
    </ul>
  );
}

export function AppShell({ session, onSignOut, signingOut, children }: { session: SessionDto; onSignOut: () => void; signingOut?: boolean; children: ReactNode }) {
  const [open, setOpen] = useState(false);
  const location = useLocation();
  const menuButton = useRef<HTMLButtonElement>(null);
  const items = navFor(session.user.role);

  // A new page closes the phone menu and moves focus to its heading, so a screen reader announces
  // the page instead of staying on the link that was followed. The first page load is left alone.
  const firstPath = useRef(location.pathname);
  useEffect(() => {
    setOpen(false);
    if (location.pathname === firstPath.current) return;
    firstPath.current = '';
    document.querySelector<HTMLElement>('main h1')?.focus({ preventScroll: false });
  }, [location.pathname]);

  const signOutButton = (
    <button
      type="button"
      onClick={onSignOut}
      disabled={signingOut}
      className="flex min-h-11 items-center whitespace-nowrap rounded-control border border-seam-strong px-3 text-sm font-semibold hover:bg-cloth-sunk md:min-h-10"
    >
      Sign out
    </button>
  );

  return (
    <div className="flex min-h-dvh flex-col">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:top-2 focus:left-2 focus:z-50 focus:bg-cloth-raised focus:p-2">
        Skip to content
      </a>
      <header className="border-b border-seam bg-cloth-raised">
        <div className="mx-auto flex max-w-6xl items-center gap-4 px-gutter py-2 md:px-gutter-wide">
          <Link to="/" className="flex shrink-0 items-center no-underline" aria-label="Wingstage home">
            <Wordmark />
          </Link>
          <span className="hidden border-l border-seam pl-4 text-sm text-slate-soft 2xl:inline">{session.workshop.name}</span>
          <nav aria-label="Main" className="ml-auto hidden lg:block">
            <NavList items={items} className="flex items-center gap-1" />
          </nav>
          <div className="hidden items-center gap-3 lg:flex">
            <span className="text-right text-sm leading-tight whitespace-nowrap">
              <span className="block font-semibold">{session.user.name}</span>
              <span className="block text-slate-soft">{ROLE_LABELS[session.user.role]}</span>
            </span>
            {signOutButton}
          </div>
          <button
            ref={menuButton}
            type="button"
            className="ml-auto inline-flex min-h-11 min-w-11 items-center justify-center gap-1 rounded-control border border-seam-strong px-2 font-semibold lg:hidden"
            aria-expanded={open}
            aria-controls="phone-menu"
            onClick={() => setOpen((o) => !o)}
          >
            {open ? <CloseIcon /> : <MenuIcon />}
            <span>Menu</span>
          </button>
        </div>
        {open ? (
          <div id="phone-menu" className="border-t border-seam px-gutter pb-4 lg:hidden">
            <p className="py-3 text-sm">
              <span className="font-semibold">{session.user.name}</span>
              <span className="text-slate-soft"> · {ROLE_LABELS[session.user.role]}</span>
              <span className="block text-slate-soft">{session.workshop.name}</span>
            </p>
            <nav aria-label="Main">
              <NavList items={items} className="flex flex-col gap-1" />
            </nav>
            <div className="mt-3">{signOutButton}</div>
          </div>
        ) : null}
      </header>
      <main id="main" className="mx-auto w-full max-w-6xl flex-1 px-gutter py-6 md:px-gutter-wide">
        {children}
      </main>
    </div>
  );
}

/** The frame for pages used before signing in: the mark, one card, nothing else. */
export function PublicFrame({ children }: { children: ReactNode }) {
  return (
    <div className="flex min-h-dvh flex-col items-center px-gutter py-10">
      <Link to="/sign-in" className="mb-8 no-underline" aria-label="Wingstage sign in">
        <Wordmark />
      </Link>
      <main id="main" className="w-full max-w-md rounded-card border border-seam bg-cloth-raised p-5 sm:p-7">
        {children}
      </main>
    </div>
  );
}
