import { z } from "zod";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { listSignedPeriods, signPayPeriod } from "~/models/pay-periods.server";
import type { Route } from "./+types/api.projects.$projectId.pay-periods";

// The typed name is the signature; the reviewer confirms the review as on the quantities page.
const signSchema = z.object({
  from: z.union([z.string(), z.number()]).transform(String).pipe(z.string().min(1, "give the period's first survey id")),
  to: z.union([z.string(), z.number()]).transform(String).pipe(z.string().min(1, "give the period's last survey id")),
  signedName: z.string().trim().min(1, "type the signer's name").max(200, "use at most 200 characters"),
  reviewed: z.literal(true, { error: "confirm the period's figures were reviewed (reviewed: true)" }),
});

const route = apiRoute<Route.LoaderArgs>({
  // GET — the signed pay periods, newest first, each as issued beside its recompute now.
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId, "quantities.read");
    return Response.json({ signed: await listSignedPeriods(project) }, { headers: { "Cache-Control": "private, no-store" } });
  },
  // POST {from, to, signedName, reviewed: true} — signs the period's report (manager): kept as issued.
  async POST({ request, params }) {
    const { project, user } = await requireApiAccess(request, params.projectId, "quantities.sign");
    const input = await readApiBody(request, signSchema, { formats: ["json"] });
    const id = await signPayPeriod(project, user, input, clientAddress(request));
    return Response.json({ id }, { status: 201 });
  },
});
export const loader = route.loader;
export const action = route.action;
