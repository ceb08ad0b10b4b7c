import { requireApiAccess } from "~/lib/api/access.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { findsCatalogueCsv } from "~/models/finds.server";
import type { Route } from "./+types/api.projects.$projectId.finds[.]csv";

const route = apiRoute<Route.LoaderArgs>({
  // GET — the catalogue with locations, for the lab (roles that may see locations only); logged in the audit log.
  async GET({ request, params }) {
    const access = await requireApiAccess(request, params.projectId, "finds.locations.read");
    const body = `\uFEFF${await findsCatalogueCsv(access.project, access, access.user, clientAddress(request))}`;
    return new Response(body, {
      headers: {
        "Content-Type": "text/csv; charset=utf-8",
        "Content-Disposition": `attachment; filename="finds-catalogue-project-${access.project.id}.csv"`,
        "Cache-Control": "private, no-store",
      },
    });
  },
});
export const loader = route.loader;
export const action = route.action;
