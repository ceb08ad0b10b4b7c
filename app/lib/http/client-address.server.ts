import { getEnv } from "../settings/env.server";

/**
 * The client's network address, for the sign-in rate limit and the audit log.
 * React Router's request carries no socket address. Behind a proxy we trust (TRUST_PROXY=1) we
 * read the first X-Forwarded-For hop; under Firmsand's own server (app/serve.mjs) we read the
 * header it sets from the socket, overwriting anything a client sent. Otherwise (a bare
 * react-router-serve) every client shares one "direct" bucket.
 */
export function clientAddress(request: Request): string {
  const env = getEnv();
  if (env.TRUST_PROXY) {
    const forwarded = request.headers.get("X-Forwarded-For")?.split(",")[0]?.trim();
    if (forwarded) return forwarded.slice(0, 64);
  }
  if (env.FIRMSAND_CLIENT_ADDRESS_HEADER) {
    const socketAddress = request.headers.get("x-firmsand-client-address")?.trim();
    if (socketAddress) return socketAddress.slice(0, 64);
  }
  return "direct";
}
