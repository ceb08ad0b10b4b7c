import { projectAccess, signedInUser, type ProjectAccess } from "~/lib/auth/access.server";
import { ConflictError } from "~/lib/errors";
import type { Action } from "~/lib/auth/permissions";
import type { UserView } from "~/lib/auth/users.server";

/**
 * The API's access check, for every `/api` route: the session cookie or a personal bearer token,
 * the project and the permission table, as the pages have them, but never a redirect. It throws
 * typed errors that apiRoute answers in JSON: no or a bad credential 401, a role the table
 * refuses 403, an unknown project 404.
 */
export async function requireApiAccess(request: Request, projectId: string | undefined, action?: Action): Promise<ProjectAccess> {
  const access = await projectAccess(request, projectId, action, "request");
  assertEntryAuthor(request, access.user);
  return access;
}

/**
 * The field page's queue sends each entry with `Firmsand-Entry-User`: the account that made it on
 * the device. Sent while another account is signed in (a tab left open, a shared phone), the entry
 * is refused (409) and waits for its author, never stored under someone else's name.
 */
export const ENTRY_USER_HEADER = "Firmsand-Entry-User";

function assertEntryAuthor(request: Request, user: UserView): void {
  const author = request.headers.get(ENTRY_USER_HEADER);
  if (author !== null && author.trim() !== String(user.id)) {
    throw new ConflictError({ field: ENTRY_USER_HEADER, message: "this entry was made on this device by another account; it is sent once that person signs in again" });
  }
}

/** Signed in (cookie or token), whatever the project: for API answers that concern no project. */
export function requireApiUser(request: Request): Promise<UserView> {
  return signedInUser(request);
}
