import { projectAccess, signedInUser, type ProjectAccess } from "~/lib/auth/access.server";
import type { Action } from "~/lib/auth/permissions";
import type { UserView } from "~/lib/auth/users.server";

/**
 * The API's access check, for every `/api` route: the session cookie or a personal bearer token,
 * the project and the permission table, as the pages have them, but never a redirect. It throws
 * typed errors that apiRoute answers in JSON: no or a bad credential 401, a role the table
 * refuses 403, an unknown project 404.
 */
export function requireApiAccess(request: Request, projectId: string | undefined, action?: Action): Promise<ProjectAccess> {
  return projectAccess(request, projectId, action, "request");
}

/** Signed in (cookie or token), whatever the project: for API answers that concern no project. */
export function requireApiUser(request: Request): Promise<UserView> {
  return signedInUser(request);
}
