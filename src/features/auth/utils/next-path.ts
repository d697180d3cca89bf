/**
 * Where to go after signing in: the `next` query parameter when it resolves to
 * a page of this site ("/jobs?status=lead"), else the dashboard. It is resolved
 * the way the browser would resolve it — which drops tabs and newlines, so
 * "/\t/evil.example" means "//evil.example" — and kept only when the origin stays ours.
 */
export function nextPath(search: string, origin: string = window.location.origin): string {
  const next = new URLSearchParams(search).get("next");
  if (!next || !next.startsWith("/")) return "/";
  let url: URL;
  try {
    url = new URL(next, origin);
  } catch {
    return "/";
  }
  if (url.origin !== origin) return "/";
  return `${url.pathname}${url.search}${url.hash}`;
}
