import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { cellLabel } from "../../shared/grid/cell-grid";
import { localDayOf } from "../../shared/local-time";
import { Assignment, Dive, DiveTeam } from "~/lib/db.server";
import { listDayPlans } from "~/models/day-plans.server";
import { planSheetText, type DayPlanView } from "~/models/assignments.server";
import { emergencyInfoSchema } from "../../shared/dive-plan/emergency-info";
import type { ProjectView } from "~/lib/auth/project-view.server";
import { makeProject } from "./helpers";

// The list of day plans: every date with cells assigned, newest first, a page at a time, with the
// teams, cell count, dives logged and the state against the project's today.

afterAll(closeSequelize);

let project: ProjectView;
let today: string;
const teams: Record<string, number> = {};

const dayOffset = (days: number) => localDayOf(Date.now() + days * 86_400_000, project.timeZone);

async function assign(date: string, team: string, cells: number) {
  for (let col = 0; col < cells; col++) {
    // A row per team keeps one cell to one team per day, as the service does.
    const row = Object.keys(teams).indexOf(team);
    await Assignment.create({ projectId: project.id, workDate: date, teamId: teams[team], row, col, label: cellLabel(row, col), hose: "Hose A", notes: "", workingDepth: null, plannedBottomMinutes: null, confirmedReason: null, createdById: null });
  }
}

async function dive(date: string, team: string) {
  await Dive.create({ projectId: project.id, diveDate: date, teamId: teams[team], diverName: "Diver", leftSurfaceAt: null, leftBottomAt: null, bottomMinutes: 30, maxDepth: 8, notes: "" });
}

beforeAll(async () => {
  project = await makeProject("day-plans");
  today = localDayOf(Date.now(), project.timeZone);
  for (const [index, name] of ["Team Heron", "Team Otter"].entries()) {
    teams[name] = (await DiveTeam.create({ projectId: project.id, name, station: "", hoses: [{ name: "Hose A", diameter: 6, diameterUnit: "in" }], members: [], sortOrder: index + 1 })).id;
  }
});

describe("listDayPlans", () => {
  it("is empty for a project with no plans", async () => {
    const page = await listDayPlans(project);
    expect(page).toMatchObject({ plans: [], total: 0, pages: 1, page: 1, today });
  });

  it("lists each date once, newest first, with its teams (roster order), cells, dives and state", async () => {
    const [tomorrow, yesterday, lastWeek] = [dayOffset(1), dayOffset(-1), dayOffset(-7)];
    await assign(tomorrow, "Team Otter", 2);
    await assign(today, "Team Heron", 1);
    await assign(yesterday, "Team Otter", 3);
    await assign(yesterday, "Team Heron", 2);
    await assign(lastWeek, "Team Heron", 4);
    await dive(yesterday, "Team Heron");
    await dive(yesterday, "Team Otter");
    const { plans, total } = await listDayPlans(project);
    expect(total).toBe(4);
    expect(plans).toEqual([
      { date: tomorrow, teams: ["Team Otter"], cells: 2, dives: 0, state: "upcoming" },
      { date: today, teams: ["Team Heron"], cells: 1, dives: 0, state: "today" },
      { date: yesterday, teams: ["Team Heron", "Team Otter"], cells: 5, dives: 2, state: "dives-logged" },
      { date: lastWeek, teams: ["Team Heron"], cells: 4, dives: 0, state: "no-dives-logged" },
    ]);
  });

  it("pages: the page size decides, the count of pages follows the total, and a page past the last is empty", async () => {
    const first = await listDayPlans(project, 1, 3);
    const second = await listDayPlans(project, 2, 3);
    expect(first.plans.map((plan) => plan.date)).toHaveLength(3);
    expect(second.plans.map((plan) => plan.date)).toEqual([dayOffset(-7)]);
    expect([first.pages, second.pages]).toEqual([2, 2]); // 4 dates in pages of 3 (computed)
    expect((await listDayPlans(project, 5, 3)).plans).toEqual([]);
  });
});

describe("the e-mailed plan sheet", () => {
  const plan = (): DayPlanView => ({
    date: "2026-11-10", lengthLabel: "ftUS", volumeLabel: "yd³", minTeamSize: 2, caution: "Information only.", source: "the table",
    teams: [{ team: { id: 1, name: "Team Heron", station: "", hoses: [{ name: "Hose A", diameter: 6, diameterUnit: "in" }], pumps: [], members: [], belowMinimum: false, retiredAt: null }, cells: [], remainingVolume: 0 }],
  });

  it("carries the emergency information, naming what is missing", () => {
    const emergency = emergencyInfoSchema.parse({ hospitalName: "Harbor General", hospitalPhone: "555-0142", emergencyNumber: "555-0100", siteAddress: "1 Spring Run Rd" });
    const text = planSheetText(project, plan(), 0, "http://127.0.0.1/plan", emergency);
    expect(text).toContain("EMERGENCY: services 555-0100");
    expect(text).toContain("Nearest hospital: Harbor General, 555-0142");
    expect(text).toContain("Nearest hyperbaric chamber: not set");
    expect(text).toContain("Incomplete, missing the nearest hyperbaric chamber and its phone; the access point — add it under Settings before diving.");
  });

  it("says plainly when none is set", () => {
    expect(planSheetText(project, plan(), 0, "http://127.0.0.1/plan", null)).toContain("EMERGENCY: No emergency information set — add it under Settings before diving.");
  });

  it("lists the team's hoses and pumps with their diameters, and each cell's hose with its own", () => {
    const withCell = plan();
    withCell.teams[0]!.team.pumps = [{ name: "Pump P1", diameter: 8, diameterUnit: "in" }];
    withCell.teams[0]!.cells = [{
      label: "C4", zone: "Vent basin", hose: "Hose A", notes: "", workingDepth: 12.5, plannedBottomMinutes: null, noDecompression: null,
      remainingThickness: null, remainingVolume: null, status: null, confirmedReason: null,
    }];
    const text = planSheetText(project, withCell, 0, "http://127.0.0.1/plan", null);
    expect(text).toContain("Hoses: Hose A (6 in). Pumps: Pump P1 (8 in).");
    expect(text).toContain("C4 | Vent basin | Hose A (6 in) | 12.5 |");
  });
});
