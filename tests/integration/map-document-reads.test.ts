import type { QueryOptions } from "sequelize";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { getSequelize } from "~/lib/db.server";
import { signIn } from "~/lib/auth/session.server";
import { inRequestScope } from "~/lib/http/request-scope.server";
import { loader as layoutLoader } from "~/routes/projects.$projectId";
import { loader as mapLoader } from "~/routes/projects.$projectId.map";
import { makeDemoSiteProject } from "./import-helpers";

// One load of the map page runs the project layout's loader and the map's side by side, each with
// a Request of its own. Both show what stops work and the held cells (the banner, the assign panel,
// the map's cells): each is read once for the page, even with the read cache off.

afterAll(closeSequelize);

describe("the map page's document", () => {
  let site: Awaited<ReturnType<typeof makeDemoSiteProject>>;
  let cookie = "";
  const statements: string[] = [];
  const listen = (_options: QueryOptions, query: unknown) => {
    statements.push(String((query as { sql?: string }).sql ?? ""));
  };

  beforeAll(async () => {
    site = await makeDemoSiteProject("map-document");
    const answer = await signIn(new Request("http://127.0.0.1/login", { method: "POST" }), site.users.manager, "/projects");
    cookie = answer.headers.getSetCookie().map((value) => value.split(";")[0]).join("; ");
    getSequelize().addHook("afterQuery", "count-statements", listen);
  });
  afterAll(() => {
    getSequelize().removeHook("afterQuery", "count-statements");
  });

  it("reads the stop-work events, the stand-downs and the held cells once for both loaders", async () => {
    const lifetime = process.env.READ_CACHE_SECONDS;
    process.env.READ_CACHE_SECONDS = "0";
    try {
      const request = () => new Request(`http://127.0.0.1/projects/${site.project.id}/map`, { headers: { Cookie: cookie } });
      const params = { projectId: String(site.project.id) };
      statements.length = 0;
      const [layout, map] = await inRequestScope(() => Promise.all([
        layoutLoader({ request: request(), params, context: {} } as never),
        mapLoader({ request: request(), params, context: {} } as never),
      ]));
      expect(layout.stoppages.stopWork).toEqual([]);
      expect(map.workStopped).toBeNull();
      const reads = (pattern: RegExp) => statements.filter((sql) => pattern.test(sql)).length;
      expect(reads(/FROM `stop_work_events`/)).toBe(1);
      expect(reads(/FROM `wildlife_stand_downs`/)).toBe(1);
      expect(reads(/FROM `hold_cells`/)).toBe(1);
    } finally {
      if (lifetime === undefined) delete process.env.READ_CACHE_SECONDS;
      else process.env.READ_CACHE_SECONDS = lifetime;
    }
  });
});
