/**
 * The link's token from the address bar: `/decide/<token>`, with nothing after it but an optional
 * slash. Anything else gives '' (the page then says the link is not whole).
 */
export function tokenFromPath(pathname: string): string {
  const m = /^\/decide\/([A-Za-z0-9_-]+)\/?$/.exec(pathname);
  return m ? m[1]! : '';
}
