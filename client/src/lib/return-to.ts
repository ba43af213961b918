const PUBLIC_PATHS = ['/sign-in', '/forgot-password', '/reset-password', '/accept-invitation', '/decide'];

export function isPublicPath(pathname: string): boolean {
  return PUBLIC_PATHS.some((p) => pathname === p || pathname.startsWith(`${p}/`));
}

/** Only a same-site path may be a return target, so a crafted link cannot bounce someone off-site. */
export function safeReturnTo(value: string | null | undefined): string | null {
  if (!value || !value.startsWith('/') || value.startsWith('//') || value.startsWith('/\\')) return null;
  if (isPublicPath(value.split('?')[0] ?? '')) return null;
  return value;
}

export function signInPath(returnTo?: string): string {
  const safe = safeReturnTo(returnTo);
  return safe && safe !== '/' ? `/sign-in?returnTo=${encodeURIComponent(safe)}` : '/sign-in';
}
