import type { Sequelize } from "sequelize";
import { hashPassword } from "../../app/lib/password.server";
import { Membership, Project, User, Zone, initModels } from "../models";
import { DEMO_PASSWORD, DEMO_PROJECT, DEMO_USERS, GRID_ORIGIN, WORK_LIMIT, ZONES } from "./demo-scenario";

/**
 * Seeds the demo scenario (one project, its zones, one account per role and a site admin) when
 * the database has no users yet. Running it again changes nothing.
 */
export async function seedDemo(sequelize: Sequelize = initModels()): Promise<"seeded" | "skipped"> {
  initModels();
  if ((await User.count()) > 0) return "skipped";
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  await sequelize.transaction(async (transaction) => {
    const project = await Project.create(
      {
        name: DEMO_PROJECT.name,
        slug: DEMO_PROJECT.slug,
        description: DEMO_PROJECT.description,
        crs: DEMO_PROJECT.crs,
        lengthUnit: DEMO_PROJECT.lengthUnit,
        gridOriginE: GRID_ORIGIN.eastingFt,
        gridOriginN: GRID_ORIGIN.northingFt,
        cellSize: DEMO_PROJECT.cellSizeFt,
        rasterResolution: DEMO_PROJECT.rasterResolutionFt,
        maxEdge: DEMO_PROJECT.maxEdgeFt,
        rotationDeg: DEMO_PROJECT.rotationDeg,
        tolerance: DEMO_PROJECT.toleranceFt,
        firmShare: DEMO_PROJECT.firmShare,
        minCoverage: DEMO_PROJECT.minCoverage,
        workLimitGeoJson: JSON.stringify(WORK_LIMIT),
        minTeamSize: DEMO_PROJECT.minTeamSize,
      },
      { transaction },
    );
    for (const zone of ZONES) {
      await Zone.create(
        { projectId: project.id, name: zone.name, sortOrder: zone.sortOrder, polygonGeoJson: JSON.stringify(zone.polygon) },
        { transaction },
      );
    }
    for (const demoUser of DEMO_USERS) {
      const user = await User.create(
        { email: demoUser.email, name: demoUser.name, passwordHash, isSiteAdmin: demoUser.isSiteAdmin ?? false },
        { transaction },
      );
      if (demoUser.role) await Membership.create({ userId: user.id, projectId: project.id, role: demoUser.role }, { transaction });
    }
  });
  return "seeded";
}
