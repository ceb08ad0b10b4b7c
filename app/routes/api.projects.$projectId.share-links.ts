import { clientAddress } from "~/lib/client-address.server";
import { jsonError, requireApiRole } from "~/lib/import/api-access.server";
import { appOrigin } from "~/lib/origin.server";
import { createShareLink, listShareLinks, shareLinkFormSchema } from "~/models/share-links.server";
import type { Route } from "./+types/api.projects.$projectId.share-links";

// GET: the project's share links (never their tokens). POST (JSON or form: name, publicText):
// 201 {"token","url"}; the token is shown this once. Outreach staff and the manager only.

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireApiRole(request, params.projectId, "share-links.manage");
  return Response.json({ shareLinks: await listShareLinks(project) }, { headers: { "Cache-Control": "no-store" } });
}

async function readBody(request: Request): Promise<Record<string, unknown>> {
  const type = request.headers.get("Content-Type") ?? "";
  if (type.includes("application/json")) return ((await request.json().catch(() => null)) ?? {}) as Record<string, unknown>;
  return Object.fromEntries(await request.formData());
}

export async function action({ request, params }: Route.ActionArgs) {
  if (request.method !== "POST") return jsonError(405, "Use POST to create a share link.");
  const { project, user } = await requireApiRole(request, params.projectId, "share-links.manage");
  const parsed = shareLinkFormSchema.safeParse(await readBody(request));
  if (!parsed.success) {
    return Response.json({ errors: parsed.error.issues.map((issue) => ({ field: issue.path.join("."), message: issue.message })) }, { status: 422 });
  }
  const created = await createShareLink(project, user, parsed.data, appOrigin(request), clientAddress(request));
  return Response.json({ token: created.token, url: created.url }, { status: 201, headers: { "Cache-Control": "no-store" } });
}
