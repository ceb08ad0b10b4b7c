import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { AuditEvent, Invitation, Membership, OutgoingMail, User } from "~/lib/db.server";
import { action as membersAction, loader as membersLoader } from "~/routes/api.projects.$projectId.members";
import { addMember, makeProject, makeUser, requestAs, uniqueEmail } from "./helpers";

// Issue "project setup": a manager adds people through the API, as an agency's system would. An
// existing account joins at once and is told by mail (201); anyone else is invited (202).

afterAll(closeSequelize);

let projectId: number;
let managerId: number;
let viewerId: number;
type Handler = (args: never) => Promise<Response>;
const call = async (handler: Handler, userId: number, init: RequestInit = {}) => {
  const request = await requestAs(userId, `/api/projects/${projectId}/members`, init);
  return handler({ request, params: { projectId: String(projectId) }, context: {} } as never);
};
const post = (userId: number, body: unknown) => call(membersAction as never, userId, { method: "POST", body: JSON.stringify(body), headers: { "Content-Type": "application/json" } });
const errorsOf = async (response: Response) => ((await response.json()) as { errors: Array<{ field?: string; message: string }> }).errors;

beforeAll(async () => {
  projectId = (await makeProject("members-api")).id;
  managerId = (await makeUser("members-api-manager")).id;
  viewerId = (await makeUser("members-api-viewer")).id;
  await addMember(managerId, projectId, "manager");
  await addMember(viewerId, projectId, "viewer");
});

describe("POST /api/projects/<id>/members", () => {
  it("adds an existing account at once (201), tells it by mail with the role in words, and audits it", async () => {
    const diver = await makeUser("members-api-diver");
    const response = await post(managerId, { email: diver.email.toUpperCase(), role: "dive-supervisor" });
    expect(response.status).toBe(201);
    expect((await response.json()).member).toMatchObject({ userId: diver.id, email: diver.email, role: "dive-supervisor" });
    expect(await Membership.count({ where: { projectId, userId: diver.id, role: "dive-supervisor" } })).toBe(1);
    const mail = await OutgoingMail.findOne({ where: { toAddress: diver.email } });
    expect(mail?.bodyText).toContain("as dive supervisor");
    expect(mail?.bodyText).toContain(`/projects/${projectId}`);
    expect(await AuditEvent.count({ where: { projectId, action: "member-added" } })).toBe(1);
    // A member already: 409 naming email, nothing added.
    const again = await post(managerId, { email: diver.email, role: "viewer" });
    expect(again.status).toBe(409);
    expect((await errorsOf(again))[0]!.field).toBe("email");
    expect(await Membership.count({ where: { projectId, userId: diver.id } })).toBe(1);
  });

  it("invites an address with no account (202), and refuses a disabled account (409)", async () => {
    const email = uniqueEmail("members-api-newcomer");
    const response = await post(managerId, { email, role: "resource-monitor" });
    expect(response.status).toBe(202);
    expect((await response.json()).invitation).toMatchObject({ email, role: "resource-monitor" });
    expect(await Invitation.count({ where: { projectId, email, acceptedAt: null, revokedAt: null } })).toBe(1);
    const listed = await (await call(membersLoader as never, managerId)).json();
    expect(listed.invitations.map((invitation: { email: string }) => invitation.email)).toContain(email);
    expect(listed.members.map((member: { userId: number }) => member.userId)).toEqual(expect.arrayContaining([managerId, viewerId]));

    const gone = await makeUser("members-api-disabled");
    await User.update({ disabledAt: new Date() }, { where: { id: gone.id } });
    const disabled = await post(managerId, { email: gone.email, role: "viewer" });
    expect(disabled.status).toBe(409);
    expect((await errorsOf(disabled))[0]!.message).toContain("disabled");
  });

  it("refuses a viewer (403) and a body without a role (422 naming role), adding nobody", async () => {
    const before = await Membership.count({ where: { projectId } });
    expect((await post(viewerId, { email: uniqueEmail("x"), role: "viewer" })).status).toBe(403);
    expect((await call(membersLoader as never, viewerId)).status).toBe(403);
    const noRole = await post(managerId, { email: uniqueEmail("y") });
    expect(noRole.status).toBe(422);
    expect((await errorsOf(noRole))[0]!.field).toBe("role");
    expect(await Membership.count({ where: { projectId } })).toBe(before);
  });
});
