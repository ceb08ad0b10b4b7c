/**
 * Framing policy for every response: other sites may not frame Firmsand's pages (clickjacking),
 * except a route that states its own `frame-ancestors` (the public share page). Both headers are
 * sent, X-Frame-Options for older browsers and CSP frame-ancestors for the rest (W3C CSP Level 2).
 */
export function applyFramePolicy(response: Response): Response {
  const policy = response.headers.get("Content-Security-Policy");
  if (policy && /frame-ancestors/i.test(policy)) return response;
  try {
    response.headers.set("X-Frame-Options", "DENY");
    response.headers.set("Content-Security-Policy", policy ? `${policy}; frame-ancestors 'none'` : "frame-ancestors 'none'");
    return response;
  } catch {
    // Immutable headers (a fetched or static Response): copy it.
    const headers = new Headers(response.headers);
    headers.set("X-Frame-Options", "DENY");
    headers.set("Content-Security-Policy", policy ? `${policy}; frame-ancestors 'none'` : "frame-ancestors 'none'");
    return new Response(response.body, { status: response.status, statusText: response.statusText, headers });
  }
}
