/**
 * The token of an e-mailed link (/join#token=…, /reset-password#token=…). It rides in
 * the fragment, which the browser never sends to a server. Null when it is missing.
 */
export function readLinkToken(hash: string): string | null {
  const token = new URLSearchParams(hash.replace(/^#/, "")).get("token")?.trim();
  return token ? token : null;
}
