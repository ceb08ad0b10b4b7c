import { ForbiddenError } from "../errors";
import { apiErrorResponse } from "../api/errors.server";
import { getEnv } from "../settings/env.server";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * The app's own origin, as configured (APP_ORIGIN, or HOST and PORT outside production). Never
 * the request's: its Host header is the client's to choose, and e-mailed links built from it
 * would point wherever the client wished.
 */
export function appOrigin(): string {
  return getEnv().APP_ORIGIN;
}

/**
 * Refuses a mutating request whose Origin header is missing or names another site: forms
 * posted from elsewhere (cross-site request forgery) get a 403, in the API's JSON shape under
 * /api. Browsers send Origin on every POST, so a same-site form always passes. Called once, from
 * the root route's middleware.
 */
export function assertSameOrigin(request: Request): void {
  if (SAFE_METHODS.has(request.method.toUpperCase())) return;
  // A bearer-token request authenticates by its token alone (never the cookie, see
  // getOptionalUser), and a browser cannot add that header to a cross-site form: no forgery risk.
  if (/^Bearer\s/i.test(request.headers.get("Authorization") ?? "")) return;
  const origin = request.headers.get("Origin");
  if (origin && origin === appOrigin()) return;
  if (new URL(request.url).pathname.startsWith("/api/")) {
    throw apiErrorResponse(
      new ForbiddenError("This request came from another site (its Origin header is missing or not Firmsand's), so Firmsand refused it. A program sends a personal API token as Authorization: Bearer <token> instead of a session cookie."),
    );
  }
  throw new Response("This form was sent from another site, so Firmsand refused it. Reload the page and try again.", {
    status: 403,
    statusText: "Forbidden",
  });
}

const LOOPBACK = new Set(["127.0.0.1", "localhost", "[::1]", "::1"]);

/** Whether cookies for this request must be Secure: https, or production off loopback (browsers drop Secure cookies sent over http). */
export function isSecureRequest(request: Request): boolean {
  const url = new URL(request.url);
  if (url.protocol === "https:") return true;
  if (LOOPBACK.has(url.hostname)) return false;
  return getEnv().NODE_ENV === "production";
}
