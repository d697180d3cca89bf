/**
 * Every state-changing /api request must carry this header with the value "1".
 * A cross-site page cannot add a custom header without a CORS preflight, which
 * the server never grants, so its forged requests are refused (403).
 */
export const CSRF_HEADER = "X-Runwright-Request";
