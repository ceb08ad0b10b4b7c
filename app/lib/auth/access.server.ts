import { redirect } from "react-router";
import { Membership, type Role } from "~/lib/db.server";
import { ArchivedProjectError, ConflictError, ForbiddenError, NotFoundError, NotSignedInError } from "~/lib/errors";
import { can, refusedByProjectState, roleAllows, type Access, type Action } from "~/lib/auth/permissions";
import { findProject, presentProject, type ProjectView } from "~/lib/auth/project-view.server";
import { getUserView, type UserView } from "~/lib/auth/users.server";
import { apiErrorResponse } from "../api/errors.server";
import { hasBearer, lookUpBearer } from "./api-token.server";
import { currentSignInSession } from "./session.server";
import { urlIdSchema } from "../http/url-id";
import { oncePerRequest } from "../http/request-scope.server";
import { cachedReadFor } from "../cache/read-cache.server";

// The one place that decides access. The core (signedInUser, projectAccess) throws typed errors;
// pages call requireUser / requireRole, which answer as pages do (a redirect to sign in, a 403 or
// 404 page), and the API calls requireApiAccess (app/lib/api), which answers in JSON.

/**
 * The signed-in user, or null (a session or token of a deleted or disabled account counts as
 * signed out: getUserView refuses them). A request
 * with `Authorization: Bearer <personal API token>` is that token's user and nobody else: its
 * cookie is ignored, which is what lets the Origin check pass bearer requests. A token reaches the
 * `/api` routes only: on any other route (the account page, where tokens are made and revoked) it
 * signs nobody in, so a leaked token cannot mint another and revoking it ends its holder's access.
 */
export async function getOptionalUser(request: Request): Promise<UserView | null> {
  if (hasBearer(request)) return (await bearerUser(request)).user;
  return sessionUser(request);
}

function sessionUser(request: Request): Promise<UserView | null> {
  return oncePerRequest(request, "session-user", async () => {
    // The session row is read on every request (it may have ended); the account behind it is
    // kept between requests until something is written.
    const session = await currentSignInSession(request);
    return session ? cachedReadFor(request, `user:${session.userId}`, () => getUserView(session.userId)) : null;
  });
}

const READING_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/** A bearer request's user, or why it has none (for the 401's message). A read-only token asking to change something is a 403. */
function bearerUser(request: Request): Promise<{ user: UserView; refusal?: never } | { user: null; refusal: string }> {
  return oncePerRequest(request, "bearer-user", () => lookUpBearerUser(request));
}

async function lookUpBearerUser(request: Request): Promise<{ user: UserView; refusal?: never } | { user: null; refusal: string }> {
  if (!isApiPath(new URL(request.url).pathname)) return { user: null, refusal: "Personal API tokens open the /api routes only; this page needs a signed-in session." };
  const token = await lookUpBearer(request.headers.get("Authorization"));
  if (token === "expired") return { user: null, refusal: "The API token has expired; create a new one on your account page." };
  const user = token === null ? null : await getUserView(token.userId);
  if (!token || !user) return { user: null, refusal: "The API token is unknown or has been revoked, or its account is disabled." };
  if (token.scope === "read-only" && !READING_METHODS.has(request.method.toUpperCase())) {
    throw new ForbiddenError("This API token is read-only: it may read but not change anything. Use a read-write token for this request.");
  }
  return { user };
}

function isApiPath(pathname: string): boolean {
  return pathname === "/api" || pathname.startsWith("/api/");
}

/** The signed-in user, or a NotSignedInError saying what to send. */
export async function signedInUser(request: Request): Promise<UserView> {
  if (hasBearer(request)) {
    const bearer = await bearerUser(request);
    if (bearer.user) return bearer.user;
    throw new NotSignedInError(bearer.refusal);
  }
  const user = await sessionUser(request);
  if (user) return user;
  throw new NotSignedInError("Sign in, or send a personal API token as Authorization: Bearer <token>.");
}

export interface ProjectAccess extends Access {
  user: UserView;
  project: ProjectView;
  /** The user's role on the project; null for a site admin who is not a member. */
  role: Role | null;
}

/**
 * The signed-in user's access to a project for `action`, as the permission table (permissions.ts)
 * allows it; by default reading the project, which every member and a site admin may. Signed out:
 * NotSignedInError; an unknown project: NotFoundError; a non-member or a role the table does not
 * allow: ForbiddenError (`refused` names what is refused: "page" or "request").
 */
export async function projectAccess(request: Request, projectId: string | number | undefined, action: Action = "project.read", refused = "page"): Promise<ProjectAccess> {
  const user = await signedInUser(request);
  const parsedId = urlIdSchema.safeParse(projectId);
  if (!parsedId.success) throw new NotFoundError("There is no such project.");
  const key = `project-${parsedId.data}-of-${user.id}`;
  const found = await oncePerRequest(request, key, () => cachedReadFor(request, key, async () => {
    const [project, membership] = await Promise.all([
      findProject(parsedId.data),
      Membership.findOne({ where: { projectId: parsedId.data, userId: user.id }, attributes: ["role"], raw: true }),
    ]);
    if (!project) return null;
    return { project: presentProject(project), role: membership?.role ?? null };
  }));
  if (!found) throw new NotFoundError("There is no such project.");
  // A fresh object per call: a caller may keep or change its own view of the project.
  const access: ProjectAccess = { role: found.role, isSiteAdmin: user.isSiteAdmin, archived: found.project.archivedAt !== null, user, project: { ...found.project } };
  // An archived project is read-only: a request that may change something (any method but GET,
  // HEAD and OPTIONS) is refused here, for every page action and API route at once, unless it
  // restores the project. Reading requests are checked against the role alone, so a page whose
  // controls change things still opens (read-only) and a loader's `can` hides those controls.
  if (READING_METHODS.has(request.method.toUpperCase())) {
    if (!roleAllows(access, action)) assertAllowed(access, action, refused);
  } else {
    assertAllowed(access, action, refused);
    // Even under a reading action (a page whose action checks its intent's permission later).
    if (access.archived && action !== "project.restore") throw archivedRefusal(access);
  }
  return access;
}

/**
 * A ForbiddenError unless the table allows `action` (for a request whose permission depends on
 * what it asks); an ArchivedProjectError (409) when the role allows it but the project's state
 * does not (an archived project, or restoring an open one).
 */
export function assertAllowed(access: ProjectAccess, action: Action, refused = "page"): void {
  if (can(access, action)) return;
  if (roleAllows(access, action) && refusedByProjectState(access, action)) {
    if (action === "project.restore") throw new ConflictError("This project is not archived; there is nothing to restore.");
    throw archivedRefusal(access);
  }
  throw new ForbiddenError(access.role === null && !access.isSiteAdmin ? "You are not a member of this project." : `Your role on this project does not allow this ${refused}.`);
}

function archivedRefusal(access: ProjectAccess): ArchivedProjectError {
  const day = access.project.archivedAt?.slice(0, 10) ?? "";
  return new ArchivedProjectError(
    { message: `${access.project.name} was archived on ${day} and is read-only: nothing in it can be changed. A site admin can restore it.` },
    { code: "project-archived", archivedAt: access.project.archivedAt },
  );
}

// ——— Pages.

/**
 * A page's answer to a refusal: signed out → redirect to /login?next=<this page> (or, for a
 * program sending a bearer token, the API's JSON 401 rather than a sign-in page); refused → 403;
 * unknown → 404. Anything else is rethrown as it is.
 */
function pageRefusal(request: Request, error: unknown): unknown {
  if (error instanceof NotSignedInError) {
    if (hasBearer(request)) return apiErrorResponse(error);
    const url = new URL(request.url);
    return redirect(`/login?next=${encodeURIComponent(url.pathname + url.search)}`);
  }
  return refusedPage(error);
}

function refusedPage(error: unknown): unknown {
  if (error instanceof ConflictError) return new Response(error.message, { status: 409, statusText: "Conflict" });
  if (error instanceof ForbiddenError) return new Response(error.message, { status: 403, statusText: "Forbidden" });
  if (error instanceof NotFoundError) return new Response(error.message, { status: 404, statusText: "Not Found" });
  return error;
}

/**
 * A page's reading of a URL parameter (`parse` throws the model's NotFoundError for one that names
 * nothing, e.g. a day that cannot exist): answered with the app's not-found page (404), as an
 * unknown project is.
 */
export function pageParam<T>(parse: () => T): T {
  try {
    return parse();
  } catch (error) {
    throw refusedPage(error);
  }
}

/** The signed-in user; a signed-out request is redirected to /login?next=<this page>. */
export async function requireUser(request: Request): Promise<UserView> {
  try {
    return await signedInUser(request);
  } catch (error) {
    throw pageRefusal(request, error);
  }
}

/** A site admin only (e.g. /dev/mail). */
export async function requireSiteAdmin(request: Request): Promise<UserView> {
  const user = await requireUser(request);
  if (!user.isSiteAdmin) throw new Response("Only a site administrator may open this page.", { status: 403, statusText: "Forbidden" });
  return user;
}

/** projectAccess for a page: signed out → sign in, unknown project → 404, refused → 403. */
export async function requireRole(request: Request, projectId: string | number | undefined, action: Action = "project.read"): Promise<ProjectAccess> {
  try {
    return await projectAccess(request, projectId, action);
  } catch (error) {
    throw pageRefusal(request, error);
  }
}

/** assertAllowed for a page: a 403 unless the table allows `action`. */
export function requireAllowed(access: ProjectAccess, action: Action): void {
  try {
    assertAllowed(access, action);
  } catch (error) {
    throw refusedPage(error);
  }
}
