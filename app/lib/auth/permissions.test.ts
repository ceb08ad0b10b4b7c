import { describe, expect, it } from "vitest";
import { ACTIONS, allowedActions, can, canCreateProjects, canManageAccounts, type Action } from "./permissions";
import { ROLES, type Role } from "./roles";

// The expected table, written out by hand from the product's roles (DESIGN.md, "Who uses it"), not
// generated from PERMISSIONS: a wrong entry in the table fails here.
const EXPECTED: Record<Role, Action[]> = {
  manager: ["project.read", "quantities.read", "quantities.sign", "members.manage", "audit.read", "project.configure", "map.configure", "surveys.import", "surveys.import.others", "surveys.retract", "plans.assign", "dives.log", "dewatering.log", "samples.record", "water-quality.record", "water-quality.configure", "stop-work.resume", "wildlife.record", "share-links.manage", "finds.read", "finds.log", "finds.locations.read", "holds.lift", "reports.read", "reports.sign", "reports.distribute", "teams.manage", "project.archive"],
  surveyor: ["project.read", "quantities.read", "surveys.import", "finds.read", "reports.read"],
  "dive-supervisor": ["project.read", "quantities.read", "plans.assign", "dives.log", "wildlife.record", "finds.read", "reports.read", "reports.sign", "teams.manage"],
  dewatering: ["project.read", "dewatering.log", "water-quality.record", "wildlife.record", "finds.read", "reports.read"],
  // Finds (DESIGN.md): the monitor logs them; locations for monitor, manager and site admin only.
  "resource-monitor": ["project.read", "samples.record", "water-quality.record", "stop-work.resume", "wildlife.record", "finds.read", "finds.log", "finds.locations.read", "holds.lift", "reports.read"],
  // Outreach sees nothing of finds, nor the daily reports.
  outreach: ["project.read", "share-links.manage"],
  viewer: ["project.read", "quantities.read", "finds.read", "reports.read"],
};

describe("the permission table", () => {
  it("allows each role exactly the actions written out above", () => {
    for (const role of ROLES) {
      expect(allowedActions({ role, isSiteAdmin: false }).sort(), role).toEqual([...EXPECTED[role]].sort());
    }
  });

  it("lets a site admin do everything, member or not (restoring only what is archived)", () => {
    expect(allowedActions({ role: null, isSiteAdmin: true })).toEqual(ACTIONS.filter((action) => action !== "project.restore"));
    expect(can({ role: null, isSiteAdmin: true, archived: true }, "project.restore")).toBe(true);
    expect(can({ role: "viewer", isSiteAdmin: true }, "map.configure")).toBe(true);
  });

  it("allows nothing to someone who is neither a member nor a site admin", () => {
    expect(allowedActions({ role: null, isSiteAdmin: false })).toEqual([]);
  });
});

describe("an archived project", () => {
  // Written out by hand: what stays open once a project is archived (DESIGN.md: readable and exportable).
  const READS: Action[] = ["project.read", "quantities.read", "audit.read", "finds.read", "finds.locations.read", "reports.read"];

  it("allows each role its reads and nothing else; a site admin its reads and restoring it", () => {
    for (const role of ROLES) {
      expect(allowedActions({ role, isSiteAdmin: false, archived: true }).sort(), role).toEqual(EXPECTED[role].filter((action) => READS.includes(action)).sort());
    }
    expect(allowedActions({ role: null, isSiteAdmin: true, archived: true }).sort()).toEqual([...READS, "project.restore"].sort());
  });

  it("can be restored by a site admin only, and never archived twice", () => {
    expect(can({ role: "manager", isSiteAdmin: false, archived: true }, "project.restore")).toBe(false);
    expect(can({ role: "manager", isSiteAdmin: false, archived: true }, "project.archive")).toBe(false);
    expect(can({ role: "manager", isSiteAdmin: false }, "project.archive")).toBe(true);
    expect(can({ role: "manager", isSiteAdmin: false }, "project.restore")).toBe(false);
  });
});

describe("who may create projects", () => {
  it("a site admin, or a user a site admin allowed; nobody else, whatever their project roles", () => {
    expect(canCreateProjects({ isSiteAdmin: true, mayCreateProjects: false })).toBe(true);
    expect(canCreateProjects({ isSiteAdmin: false, mayCreateProjects: true })).toBe(true);
    expect(canCreateProjects({ isSiteAdmin: false, mayCreateProjects: false })).toBe(false);
  });
});

describe("who may manage accounts", () => {
  it("a site admin only; being allowed to create projects does not extend to accounts", () => {
    expect(canManageAccounts({ isSiteAdmin: true })).toBe(true);
    expect(canManageAccounts({ isSiteAdmin: false, mayCreateProjects: true } as { isSiteAdmin: boolean })).toBe(false);
    expect(canManageAccounts({ isSiteAdmin: false })).toBe(false);
  });
});
