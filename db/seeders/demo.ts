import type { Sequelize } from "sequelize";
import { hashPassword } from "../../app/lib/auth/password.server";
import { CellResult, Dive, DiveTeam, Membership, Project, Survey, User, Zone, initModels } from "../models";
import { seedDemoDewatering } from "./demo-dewatering";
import { seedDemoDiveTeams } from "./demo-dive-teams";
import { seedDemoBaskets, seedDemoFinds } from "./demo-finds";
import { seedDemoSurveys } from "./demo-surveys";
import { seedDemoWaterQuality } from "./demo-water-quality";
import { DEMO_PASSWORD, DEMO_PROJECT, DEMO_USERS, demoProjectInput } from "./demo-scenario";

/**
 * Seeds the demo scenario (one project, its zones, one account per role and a site admin) when
 * the database has no users yet, and the demo surveys when the demo project has none (so a
 * database seeded by an older Firmsand gains them). Running it again changes nothing.
 */
export async function seedDemo(sequelize: Sequelize = initModels()): Promise<"seeded" | "skipped"> {
  initModels();
  if ((await User.count()) > 0) {
    const surveys = await seedMissingDemoSurveys();
    const dives = await seedDemoDives();
    const dewatering = await seedDemoDewatering();
    const waterQuality = await seedDemoWaterQuality();
    const finds = await seedDemoFinds();
    const baskets = await seedDemoBaskets();
    return surveys || dives || dewatering || waterQuality || finds || baskets ? "seeded" : "skipped";
  }
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  await sequelize.transaction(async (transaction) => {
    const users = new Map<string, User>();
    for (const demoUser of DEMO_USERS) {
      users.set(demoUser.email, await User.create(
        { email: demoUser.email, name: demoUser.name, passwordHash, isSiteAdmin: demoUser.isSiteAdmin },
        { transaction },
      ));
    }
    // The project through the same service as the API and the new-project form, by the site admin,
    // naming the demo's manager.
    const { createProject, newProjectSchema } = await import("../../app/models/project-setup.server");
    const { presentUser } = await import("../../app/lib/auth/users.server");
    const admin = DEMO_USERS.find((demoUser) => demoUser.isSiteAdmin)!;
    const manager = DEMO_USERS.find((demoUser) => demoUser.role === "manager")!;
    const { id: projectId } = await createProject(presentUser(users.get(admin.email)!), newProjectSchema.parse(demoProjectInput(manager.email)), { transaction });
    for (const demoUser of DEMO_USERS) {
      if (demoUser.role && demoUser.role !== "manager") await Membership.create({ userId: users.get(demoUser.email)!.id, projectId, role: demoUser.role }, { transaction });
    }
  });
  // The demo surveys, through the sounding import (issue 4).
  await seedDemoSurveys((message) => console.error(message));
  await seedDemoDives();
  await seedDemoDewatering();
  await seedDemoWaterQuality();
  await seedDemoFinds();
  await seedDemoBaskets();
  return "seeded";
}

/**
 * Invented dives for the demo's dive log: two November days in the lower run, each on cells
 * assigned to the team that day (the log takes dives on assigned cells only). The lower run has
 * about 7 ft of water over the muck, so a diver's maximum depth is a foot or so more; no dive
 * comes near the table's no-decompression figure.
 */
const DEMO_DIVES = [
  { date: "2026-11-10", team: "Team Limpkin", hose: "Hose A", cells: [0, 1], dives: [
    { diver: "Odessa Marchetti", leftSurface: "08:10", leftBottom: "09:25", maxDepth: 8.2, cells: [0], notes: "Muck softer than the probe suggested near the bank." },
    { diver: "Juniper Adeyemi", leftSurface: "10:05", leftBottom: "11:20", maxDepth: 8.5, cells: [0, 1], notes: "" },
  ] },
  { date: "2026-11-12", team: "Team Gar", hose: "Hose C", cells: [2, 3], dives: [
    { diver: "Florian Bexley", leftSurface: null, leftBottom: null, bottomMinutes: 95, maxDepth: 8.4, cells: [2, 3], notes: "Visibility under a foot after 10:00; suction slowed." },
  ] },
] as const;

/**
 * Adds the demo dives (and the assignments they were made on) when the demo project has none,
 * through the same services as the plan page and the dive log, so assignments get their working
 * depths from the surfaces and dives their no-decompression flags.
 */
async function seedDemoDives(): Promise<boolean> {
  const project = await Project.findOne({ where: { slug: DEMO_PROJECT.slug } });
  if (!project || (await Dive.count({ where: { projectId: project.id } })) > 0) return false;
  // Imported lazily, as the import service is: they pull in the app's modules.
  const { createAssignments } = await import("../../app/models/assignments.server");
  const { diveInputSchema, recordDive } = await import("../../app/models/dives.server");
  const { presentProject } = await import("../../app/lib/auth/project-view.server");
  const { presentUser } = await import("../../app/lib/auth/users.server");
  await seedDemoDiveTeams();
  const teams = new Map((await DiveTeam.findAll({ where: { projectId: project.id } })).map((team) => [team.name, team]));
  const lowerRun = await Zone.findOne({ where: { projectId: project.id, name: "Lower run" } });
  const cells = await CellResult.findAll({ where: { projectId: project.id, status: "in-work", ...(lowerRun ? { zoneId: lowerRun.id } : {}) }, order: [["row", "ASC"], ["col", "ASC"]], limit: 4 });
  const supervisor = await User.findOne({ where: { email: "divesup@example.org" } });
  if (cells.length < 4 || !supervisor || DEMO_DIVES.some((day) => !teams.has(day.team))) return false;
  const projectView = presentProject(project);
  const supervisorView = presentUser(supervisor);
  for (const day of DEMO_DIVES) {
    // A refusal throws (a typed error naming the problem), which fails the seed loudly.
    await createAssignments(projectView, supervisorView, {
      date: day.date, team: day.team, hose: day.hose, cells: day.cells.map((index) => cells[index].label), notes: "", bottomTimeMinutes: 90,
    });
    for (const entry of day.dives) {
      const input = diveInputSchema.parse({ date: day.date, team: day.team, ...entry, cells: entry.cells.map((index) => cells[index].label) });
      await recordDive(projectView, supervisorView, input, null);
    }
  }
  return true;
}

/** Imports the demo surveys into an existing demo project that has no surveys yet. */
async function seedMissingDemoSurveys(): Promise<boolean> {
  const project = await Project.findOne({ where: { slug: DEMO_PROJECT.slug } });
  if (!project || (await Survey.count({ where: { projectId: project.id } })) > 0) return false;
  await seedDemoSurveys((message) => console.error(message));
  return true;
}
