import { existsSync, readFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { z } from "zod";

// The database connection's settings, parsed once with zod at first use. They live beside the
// connection so that nothing under db/ reads the app's modules (the app's own environment is
// app/lib/settings/env.server.ts).

/** Where the bring-up scripts keep per-machine secrets (git-ignored). */
export const DATA_DIR = resolve(process.cwd(), ".data");

const databaseSchema = z.object({
  DB_HOST: z.string().min(1).default("127.0.0.1"),
  DB_PORT: z.coerce.number().int().min(1).max(65535).default(3307),
  DB_NAME: z.string().min(1).default("firmsand"),
  DB_USER: z.string().min(1).default("firmsand"),
  DB_PASSWORD: z.string().optional(),
});

export type DatabaseSettings = Omit<z.infer<typeof databaseSchema>, "DB_PASSWORD"> & { DB_PASSWORD: string };

let parsed: DatabaseSettings | undefined;

export function getDatabaseSettings(): DatabaseSettings {
  if (parsed) return parsed;
  const settings = parseEnvironment(databaseSchema);
  // Without DB_PASSWORD, the password the bring-up generated for this checkout's private MariaDB.
  const generated = join(DATA_DIR, "mariadb-app-password.secret");
  const password = settings.DB_PASSWORD ?? (existsSync(generated) ? readFileSync(generated, "utf8").trim() : "");
  parsed = { ...settings, DB_PASSWORD: password };
  return parsed;
}

/** `process.env` read through `schema`; an invalid setting stops the start with every problem named. */
export function parseEnvironment<Schema extends z.ZodType>(schema: Schema): z.output<Schema> {
  const result = schema.safeParse(process.env);
  if (!result.success) {
    const problems = result.error.issues.map((issue) => `${issue.path.join(".")}: ${issue.message}`).join("; ");
    throw new Error(`Firmsand's environment is not valid: ${problems}`);
  }
  return result.data;
}
