import type { ButtonHTMLAttributes, ReactNode } from 'react';

type Variant = 'primary' | 'secondary' | 'quiet';

// The look of components/ui/button's Button at its 44 px size. That module also holds the router's
// link button, and the owner's page is built without the router, so the page keeps its own copy.
const base =
  'inline-flex min-h-tap items-center justify-center gap-2 rounded-control px-5 text-base font-semibold transition-colors disabled:cursor-not-allowed disabled:opacity-60 no-underline';
const variants: Record<Variant, string> = {
  primary: 'bg-harbour text-on-harbour hover:bg-harbour-deep border border-harbour',
  secondary: 'bg-cloth-raised text-slate border border-seam-strong hover:bg-cloth-sunk',
  quiet: 'bg-transparent text-harbour-deep hover:bg-cloth-sunk border border-transparent underline-offset-2 hover:underline',
};

/** A 44 px button for the owner's pages. */
export function OwnerButton({
  variant = 'primary',
  busy = false,
  className = '',
  children,
  type = 'button',
  ...rest
}: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant; busy?: boolean; children: ReactNode }) {
  return (
    <button type={type} className={`${base} ${variants[variant]} ${className}`} disabled={busy || rest.disabled} aria-busy={busy || undefined} {...rest}>
      {busy ? <span className="inline-block size-3.5 animate-spin rounded-full border-2 border-current border-r-transparent" aria-hidden="true" /> : null}
      {children}
    </button>
  );
}
