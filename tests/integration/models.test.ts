import { afterAll, describe, expect, it } from "vitest";
import { UniqueConstraintError } from "sequelize";
import { closeSequelize } from "../../db/connection.server";
import { AuditEvent, Membership, Project, User, Zone } from "~/lib/db.server";
import { recordAudit, AUDIT_ACTIONS } from "~/lib/audit/audit.server";
import { addMember, makeProject, makeUser } from "./helpers";

afterAll(closeSequelize);

describe("models against MariaDB", () => {
  it("refuses a second account with the same e-mail", async () => {
    const user = await makeUser("unique");
    await expect(User.create({ email: user.email, name: "Copy", passwordHash: "x" })).rejects.toBeInstanceOf(UniqueConstraintError);
  });

  it("keeps one membership per user and project", async () => {
    const user = await makeUser("member");
    const project = await makeProject("member");
    await addMember(user.id, project.id, "viewer");
    await expect(addMember(user.id, project.id, "manager")).rejects.toBeInstanceOf(UniqueConstraintError);
  });

  it("refuses a role outside the seven project roles", async () => {
    const user = await makeUser("badrole");
    const project = await makeProject("badrole");
    // The column is an ENUM of the seven role names; strict SQL mode rejects anything else.
    await expect(Membership.create({ userId: user.id, projectId: project.id, role: "captain" as never })).rejects.toThrow();
  });

  it("reads measures back as numbers, not strings (DOUBLE columns)", async () => {
    const project = await makeProject("double");
    const read = await Project.findByPk(project.id);
    expect(typeof read!.gridOriginE).toBe("number");
    expect(read!.gridOriginE).toBe(600_000.5);
    expect(read!.gridOriginN).toBe(1_600_000.25);
    expect(read!.tolerance).toBe(0.25);
  });

  it("deletes a project's zones and memberships with the project (foreign keys cascade)", async () => {
    const user = await makeUser("cascade");
    const project = await makeProject("cascade");
    await addMember(user.id, project.id, "surveyor");
    await Zone.create({ projectId: project.id, name: "Vent basin", polygonGeoJson: "{}" });
    await Project.destroy({ where: { id: project.id } });
    expect(await Zone.count({ where: { projectId: project.id } })).toBe(0);
    expect(await Membership.count({ where: { projectId: project.id } })).toBe(0);
  });

  it("stores audit detail as JSON and times in UTC", async () => {
    const user = await makeUser("audit");
    const before = Date.now();
    await recordAudit({ action: AUDIT_ACTIONS.signIn, userId: user.id, ip: "direct", detail: { email: user.email, attempt: 2 } });
    const event = await AuditEvent.findOne({ where: { userId: user.id } });
    const detail = typeof event!.detail === "string" ? JSON.parse(event!.detail) : event!.detail;
    expect(detail).toEqual({ email: user.email, attempt: 2 });
    // DATETIME keeps whole seconds; the stored instant is within a few seconds of now.
    expect(Math.abs(event!.createdAt.getTime() - before)).toBeLessThan(5_000);
  });
});
