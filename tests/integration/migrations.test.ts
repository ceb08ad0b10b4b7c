import { afterAll, describe, expect, it } from "vitest";
import { QueryTypes } from "sequelize";
import { closeSequelize, getSequelize } from "../../db/connection.server";
import { createUmzug, migrationFiles } from "../../db/umzug";

afterAll(async () => {
  // Leave the database fully migrated for whatever runs next.
  await createUmzug(getSequelize()).up();
  await closeSequelize();
});

async function tables(): Promise<string[]> {
  const rows = await getSequelize().query<{ name: string }>(
    "SELECT table_name AS name FROM information_schema.tables WHERE table_schema = DATABASE() ORDER BY table_name",
    { type: QueryTypes.SELECT },
  );
  return rows.map((row) => row.name);
}

/** Every column as "table.column type", so a down that forgets one shows after the round trip. */
async function columns(): Promise<string[]> {
  const rows = await getSequelize().query<{ name: string }>(
    "SELECT CONCAT(table_name, '.', column_name, ' ', column_type) AS name FROM information_schema.columns WHERE table_schema = DATABASE() ORDER BY table_name, column_name",
    { type: QueryTypes.SELECT },
  );
  return rows.map((row) => row.name);
}

const FOUNDATION_TABLES = ["audit_events", "invitations", "login_attempts", "memberships", "password_resets", "projects", "users", "zones"];

describe("migrations", () => {
  it("each migration file exports up and down", async () => {
    for (const file of migrationFiles()) {
      const module = await import(/* @vite-ignore */ new URL(`../../db/migrations/${file}`, import.meta.url).href);
      expect(typeof module.up, file).toBe("function");
      expect(typeof module.down, file).toBe("function");
    }
  });

  it("go all the way down and back up, leaving the same tables", async () => {
    const umzug = createUmzug(getSequelize());
    await umzug.up();
    const migrated = await tables();
    const migratedColumns = await columns();
    for (const table of FOUNDATION_TABLES) expect(migrated).toContain(table);
    // Project setup (0006): identity, time zone, datum; who may create projects. Disabling (0008).
    // Dewatering (0009): the solids' specific gravity and the haul cake solids default; its tables. Pay periods (0012).
    for (const table of ["dewatering_shifts", "geotextile_tubes", "tube_fills", "haul_sites", "hauls", "sediment_samples", "jar_tests", "jar_test_photos", "haul_photos", "water_quality_reading_photos"]) expect(migrated).toContain(table);
    for (const column of ["projects.overDredgeAllowance", "pay_period_reports.snapshot", "projects.agency", "projects.permitNumbers", "projects.timeZone", "projects.verticalDatum", "users.mayCreateProjects", "users.disabledAt", "users.disabledById", "projects.solidsSpecificGravity", "projects.cakeSolidsByWeight", "projects.tubeNearCapacityShare"]) {
      expect(migratedColumns.some((entry) => entry.startsWith(`${column} `)), column).toBe(true);
    }

    await umzug.down({ to: 0 });
    expect(await tables()).toEqual(["schema_migrations"]);
    expect(await umzug.executed()).toEqual([]);

    await umzug.up();
    expect(await tables()).toEqual(migrated);
    expect(await columns()).toEqual(migratedColumns);
    expect((await umzug.pending()).length).toBe(0);
  });
});
