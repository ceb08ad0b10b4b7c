import { randomBytes } from "node:crypto";
import { hashPassword } from "~/lib/auth/password.server";
import { Membership, Project, User, type Role } from "~/lib/db.server";
import { signIn } from "~/lib/auth/session.server";
import { presentProject } from "~/lib/auth/project-view.server";
import { presentUser } from "~/lib/auth/users.server";

// Test data for integration tests against the real MariaDB (firmsand_test, migrated by npm test).
// Every helper makes rows with unique names, so test files do not depend on each other.

export const ORIGIN = "http://127.0.0.1:3999";

export function uniqueEmail(label: string): string {
  return `${label}-${randomBytes(4).toString("hex")}@example.org`;
}

let passwordHashCache: string | undefined;
export const TEST_PASSWORD = "integration-password";

export async function makeUser(label: string, options: { isSiteAdmin?: boolean } = {}) {
  passwordHashCache ??= await hashPassword(TEST_PASSWORD);
  const user = await User.create({ email: uniqueEmail(label), name: `Test ${label}`, passwordHash: passwordHashCache, isSiteAdmin: options.isSiteAdmin ?? false });
  return presentUser(user);
}

export async function makeProject(label: string) {
  const project = await Project.create({
    name: `Test project ${label}`,
    slug: `test-${label}-${randomBytes(4).toString("hex")}`,
    crs: "EPSG:2237",
    lengthUnit: "us-ft",
    gridOriginE: 600_000.5,
    gridOriginN: 1_600_000.25,
    cellSize: 20,
    rasterResolution: 1,
    maxEdge: 40,
    tolerance: 0.25,
    firmShare: 0.95,
    minCoverage: 0.8,
    workLimitGeoJson: null,
  });
  return presentProject(project);
}

export async function addMember(userId: number, projectId: number, role: Role) {
  return Membership.create({ userId, projectId, role });
}

/** A GET request to `path` carrying the session cookie of `userId` (or none). */
export async function requestAs(userId: number | null, path: string, init: RequestInit = {}): Promise<Request> {
  const headers = new Headers(init.headers);
  if (userId !== null) {
    const response = await signIn(new Request(`${ORIGIN}/login`, { method: "POST" }), userId, "/");
    const cookie = response.headers.get("Set-Cookie")!.split(";")[0];
    headers.set("Cookie", cookie);
  }
  return new Request(`${ORIGIN}${path}`, { ...init, headers });
}

/** Runs `run` and returns what it threw (a Response for access denials and redirects). */
export async function thrown(run: () => Promise<unknown>): Promise<unknown> {
  try {
    await run();
  } catch (error) {
    return error;
  }
  throw new Error("expected the call to throw, but it returned");
}
