/**
 * Where to go after signing in: the `next` query parameter when it is a path on
 * this site ("/jobs"), else the dashboard. "//host" and "/\host" would leave the site.
 */
export function nextPath(search: string): string {
  const next = new URLSearchParams(search).get("next");
  if (!next || !next.startsWith("/") || next.startsWith("//") || next.startsWith("/\\")) return "/";
  return next;
}
