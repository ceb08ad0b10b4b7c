import { requireApiAccess } from "~/lib/api/access.server";
import { apiRoute } from "~/lib/api/route.server";
import { cachedReadFor } from "~/lib/cache/read-cache.server";
import { precompress, precompressedResponse } from "~/lib/http/precompressed.server";
import { keptProgress } from "~/models/progress.server";
import type { Route } from "./+types/api.projects.$projectId.progress";

const route = apiRoute<Route.LoaderArgs>({
  // GET — the progress figures (zones, totals, time series, production, forecast). Every project
  // member may read them: they are the zone-level figures the overview shows to all.
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId);
    // The figures (shared with the overview) and their gzipped JSON are kept between requests until
    // something is written (app/lib/cache/read-cache.server.ts).
    const body = await cachedReadFor(request, `progress-checked-body:${project.id}`, async () =>
      precompress(JSON.stringify(await keptProgress(request, project))));
    return precompressedResponse(request, body, { "Content-Type": "application/json; charset=utf-8", "Cache-Control": "private, no-store" });
  },
});
export const loader = route.loader;
export const action = route.action;
