import { z } from "zod";
import { requireApiAccess } from "~/lib/api/access.server";
import { readApiBody } from "~/lib/api/body.server";
import { apiRoute } from "~/lib/api/route.server";
import { ROLES } from "~/lib/auth/roles";
import { clientAddress } from "~/lib/http/client-address.server";
import { emailSchema } from "~/lib/http/form";
import { appOrigin } from "~/lib/http/origin.server";
import { addMemberByEmail, listOpenInvitations } from "~/models/invitation.server";
import { listMembers } from "~/models/membership.server";
import type { Route } from "./+types/api.projects.$projectId.members";

const memberInputSchema = z.object({
  email: emailSchema,
  role: z.enum(ROLES, { error: `a role is one of ${ROLES.join(", ")}` }),
});

const route = apiRoute<Route.LoaderArgs>({
  // GET — the members with their roles and the open invitations (manager).
  async GET({ request, params }) {
    const { project } = await requireApiAccess(request, params.projectId, "members.manage");
    const [members, invitations] = await Promise.all([listMembers(project), listOpenInvitations(project)]);
    return Response.json({ members, invitations });
  },
  // POST {email, role} (manager) → 201 {member} when the account exists (added at once, told by
  // e-mail); 202 {invitation} when an invitation was sent; 409 naming email for a member already.
  async POST({ request, params }) {
    const { user, project } = await requireApiAccess(request, params.projectId, "members.manage");
    const input = await readApiBody(request, memberInputSchema, { formats: ["json"] });
    const outcome = await addMemberByEmail(project, user, input, appOrigin(), clientAddress(request));
    if (outcome.added) return Response.json({ member: outcome.added }, { status: 201 });
    return Response.json({ invitation: outcome.invited }, { status: 202 });
  },
});
export const loader = route.loader;
export const action = route.action;
