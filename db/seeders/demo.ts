import type { Sequelize } from "sequelize";
import { hashPassword } from "../../app/lib/password.server";
import { Membership, Project, Survey, User, Zone, initModels } from "../models";
import { seedDemoSurveys } from "./demo-surveys";
import { DEMO_PASSWORD, DEMO_PROJECT, DEMO_USERS, DEMO_WORK_LIMIT, DEMO_ZONES } from "./demo-scenario";

/**
 * Seeds the demo scenario (one project, its zones, one account per role and a site admin) when
 * the database has no users yet, and the demo surveys when the demo project has none (so a
 * database seeded by an older Firmsand gains them). Running it again changes nothing.
 */
export async function seedDemo(sequelize: Sequelize = initModels()): Promise<"seeded" | "skipped"> {
  initModels();
  if ((await User.count()) > 0) return (await seedMissingDemoSurveys()) ? "seeded" : "skipped";
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  await sequelize.transaction(async (transaction) => {
    const project = await Project.create(
      { ...DEMO_PROJECT, workLimitGeoJson: JSON.stringify(DEMO_WORK_LIMIT) },
      { transaction },
    );
    for (const zone of DEMO_ZONES) {
      await Zone.create(
        { projectId: project.id, name: zone.name, sortOrder: zone.sortOrder, polygonGeoJson: JSON.stringify(zone.polygon) },
        { transaction },
      );
    }
    for (const demoUser of DEMO_USERS) {
      const user = await User.create(
        { email: demoUser.email, name: demoUser.name, passwordHash, isSiteAdmin: demoUser.isSiteAdmin },
        { transaction },
      );
      if (demoUser.role) await Membership.create({ userId: user.id, projectId: project.id, role: demoUser.role }, { transaction });
    }
  });
  // The demo surveys, through the sounding import (issue 4).
  await seedDemoSurveys((message) => console.error(message));
  return "seeded";
}

/** Imports the demo surveys into an existing demo project that has no surveys yet. */
async function seedMissingDemoSurveys(): Promise<boolean> {
  const project = await Project.findOne({ where: { slug: DEMO_PROJECT.slug } });
  if (!project || (await Survey.count({ where: { projectId: project.id } })) > 0) return false;
  await seedDemoSurveys((message) => console.error(message));
  return true;
}
