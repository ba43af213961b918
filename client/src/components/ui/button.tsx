import type { ButtonHTMLAttributes, ReactNode } from 'react';

export type Variant = 'primary' | 'secondary' | 'quiet';
export type Size = 'md' | 'lg';

const base =
  'inline-flex items-center justify-center gap-2 rounded-control font-semibold transition-colors disabled:cursor-not-allowed disabled:opacity-60 no-underline';
const variants: Record<Variant, string> = {
  primary: 'bg-harbour text-on-harbour hover:bg-harbour-deep border border-harbour',
  secondary: 'bg-cloth-raised text-slate border border-seam-strong hover:bg-cloth-sunk',
  quiet: 'bg-transparent text-harbour-deep hover:bg-cloth-sunk border border-transparent underline-offset-2 hover:underline',
};
// 40 px on staff screens (above the 24 px minimum); 44 px on the owner's pages.
const sizes: Record<Size, string> = {
  md: 'min-h-10 px-4 text-sm',
  lg: 'min-h-tap px-5 text-base',
};

export function buttonClass(variant: Variant = 'primary', size: Size = 'md', extra = ''): string {
  return `${base} ${variants[variant]} ${sizes[size]} ${extra}`;
}

export function Button({
  variant = 'primary',
  size = 'md',
  busy = false,
  className = '',
  children,
  type = 'button',
  ...rest
}: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant; size?: Size; busy?: boolean; children: ReactNode }) {
  return (
    <button type={type} className={buttonClass(variant, size, className)} disabled={busy || rest.disabled} aria-busy={busy || undefined} {...rest}>
      {busy ? <span className="inline-block size-3.5 animate-spin rounded-full border-2 border-current border-r-transparent" aria-hidden="true" /> : null}
      {children}
    </button>
  );
}
