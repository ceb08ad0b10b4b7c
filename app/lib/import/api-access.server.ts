import type { Action } from "~/lib/permissions";
import { requireRole, type ProjectAccess } from "~/lib/access.server";

/**
 * The survey API's access: the one role check (requireRole, which accepts the session cookie or
 * a personal bearer token), with its answers turned into JSON: signed out → 401, not allowed →
 * 403, no such project → 404.
 */
export function jsonError(status: number, message: string, extra: Record<string, unknown> = {}): Response {
  return Response.json({ error: message, ...extra }, { status, headers: { "Cache-Control": "no-store" } });
}

export async function requireApiRole(request: Request, projectId: string | undefined, action?: Action): Promise<ProjectAccess> {
  try {
    return await requireRole(request, projectId, action);
  } catch (thrown) {
    if (thrown instanceof Response) {
      if (thrown.status >= 300 && thrown.status < 400) throw jsonError(401, "Sign in, or send a personal API token as Authorization: Bearer <token>.");
      const message = await thrown.text().catch(() => "");
      throw jsonError(thrown.status, message || thrown.statusText || "Refused");
    }
    throw thrown;
  }
}
