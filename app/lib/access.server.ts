import { redirect } from "react-router";
import { z } from "zod";
import { Membership, type Role } from "~/lib/db.server";
import { can, type Access, type Action } from "~/lib/permissions";
import { findProject, presentProject, type ProjectView } from "~/models/project.server";
import { getUserView, type UserView } from "~/models/user.server";
import { hasBearer, userIdForBearer } from "./api-token.server";
import { getSession } from "./session.server";

// The one place that decides access. Every loader and action calls requireUser or requireRole.

function forbidden(message = "Your role on this project does not allow this page."): Response {
  return new Response(message, { status: 403, statusText: "Forbidden" });
}

function notFound(message = "There is no such project."): Response {
  return new Response(message, { status: 404, statusText: "Not Found" });
}

/**
 * The signed-in user, or null (a session for a deleted account counts as signed out). A request
 * with `Authorization: Bearer <personal API token>` is that token's user and nobody else: its
 * cookie is ignored, which is what lets the Origin check pass bearer requests.
 */
export async function getOptionalUser(request: Request): Promise<UserView | null> {
  if (hasBearer(request)) {
    const tokenUserId = await userIdForBearer(request.headers.get("Authorization"));
    return tokenUserId === null ? null : getUserView(tokenUserId);
  }
  const session = await getSession(request);
  const userId = session.get("userId");
  if (typeof userId !== "number") return null;
  return getUserView(userId);
}

/** The signed-in user; a signed-out request is redirected to /login?next=<this page>. */
export async function requireUser(request: Request): Promise<UserView> {
  const user = await getOptionalUser(request);
  if (user) return user;
  if (hasBearer(request)) {
    // A program, not a person: say so plainly instead of redirecting to the sign-in page.
    throw Response.json(
      { error: "The API token is unknown or has been revoked." },
      { status: 401, headers: { "WWW-Authenticate": 'Bearer realm="Firmsand"' } },
    );
  }
  const url = new URL(request.url);
  throw redirect(`/login?next=${encodeURIComponent(url.pathname + url.search)}`);
}

/** A site admin only (e.g. /dev/mail). */
export async function requireSiteAdmin(request: Request): Promise<UserView> {
  const user = await requireUser(request);
  if (!user.isSiteAdmin) throw forbidden("Only a site administrator may open this page.");
  return user;
}

const projectIdSchema = z.coerce.number().int().positive();

export interface ProjectAccess extends Access {
  user: UserView;
  project: ProjectView;
  /** The user's role on the project; null for a site admin who is not a member. */
  role: Role | null;
}

/**
 * The signed-in user's access to a project for `action`, as the permission table (permissions.ts)
 * allows it; by default reading the project, which every member and a site admin may. A
 * signed-out request is redirected to sign in; an unknown project is a 404; a non-member or a
 * role the table does not allow a 403.
 */
export async function requireRole(request: Request, projectId: string | number | undefined, action: Action = "project.read"): Promise<ProjectAccess> {
  const user = await requireUser(request);
  const parsedId = projectIdSchema.safeParse(projectId);
  if (!parsedId.success) throw notFound();
  const project = await findProject(parsedId.data);
  if (!project) throw notFound();
  const membership = await Membership.findOne({ where: { projectId: project.id, userId: user.id } });
  const access: ProjectAccess = { role: membership?.role ?? null, isSiteAdmin: user.isSiteAdmin, user, project: presentProject(project) };
  requireAllowed(access, action);
  return access;
}

/**
 * For an action whose permission depends on what the request asks (a form with several intents):
 * a 403 unless the table allows `action`.
 */
export function requireAllowed(access: ProjectAccess, action: Action): void {
  if (can(access, action)) return;
  throw forbidden(access.role === null && !access.isSiteAdmin ? "You are not a member of this project." : "Your role on this project does not allow this page.");
}
