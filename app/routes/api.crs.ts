import { z } from "zod";
import { requireApiUser } from "~/lib/api/access.server";
import { readApiQuery } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { searchProjectCrs } from "~/lib/geo/epsg-search.server";
import type { Route } from "./+types/api.crs";

const querySchema = z.object({
  q: z.string({ error: "Give q: an EPSG code or words of a CRS's name" }).max(100, "q is at most 100 characters"),
  limit: z.coerce.number().int().min(1).max(50).default(20),
});

const route = apiRoute<Route.LoaderArgs>({
  // GET ?q=<code or words>&limit= — projected CRSs in feet or metres from the bundled EPSG list,
  // best first (anyone signed in: the new-project form and the settings page ask it).
  async GET({ request }) {
    await requireApiUser(request);
    const { q, limit } = readApiQuery(request, querySchema);
    const results = searchProjectCrs(q, limit).map(({ code, name, unit, lengthUnit, area, matchedBy }) => ({ crs: `EPSG:${code}`, code, name, unit, lengthUnit, area, matchedBy }));
    return Response.json({ results }, { headers: { "Cache-Control": "private, max-age=3600" } });
  },
});
export const loader = route.loader;
export const action = route.action;
