import { QueryTypes } from "sequelize";
import { getSequelize } from "~/lib/db.server";

const DATABASE_TIMEOUT_MS = 2_000;

// A liveness probe: the app answers and the database answers a trivial query in time.
// Each call asks the pool afresh, so a restarted database is seen as up again without a restart.
export async function loader() {
  let timer: NodeJS.Timeout | undefined;
  try {
    await Promise.race([
      getSequelize().query("SELECT 1 AS up", { type: QueryTypes.SELECT }),
      new Promise((_, reject) => {
        timer = setTimeout(() => reject(new Error("database timeout")), DATABASE_TIMEOUT_MS);
      }),
    ]);
    return Response.json({ ok: true, db: "up" }, { headers: { "Cache-Control": "no-store" } });
  } catch {
    return Response.json({ ok: false, db: "down" }, { status: 503, headers: { "Cache-Control": "no-store" } });
  } finally {
    clearTimeout(timer);
  }
}
