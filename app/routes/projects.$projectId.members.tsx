import { Form, data } from "react-router";
import { z } from "zod";
import { ActionMessages } from "~/components/form-message";
import { ConfirmedActionForm } from "~/components/confirmed-action-form";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { requireRole } from "~/lib/auth/access.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { DomainError } from "~/lib/errors";
import { ROLES, roleLabel } from "~/lib/auth/roles";
import { emailSchema, parseForm } from "~/lib/http/form";
import { appOrigin } from "~/lib/http/origin.server";
import { createInvitation, listOpenInvitations, revokeInvitation } from "~/models/invitation.server";
import { changeMemberRole, listMembers, removeMember } from "~/models/membership.server";
import type { Route } from "./+types/projects.$projectId.members";
import { readPageForm } from "~/lib/http/body.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project, user } = await requireRole(request, params.projectId, "members.manage");
  const [members, invitations] = await Promise.all([listMembers(project), listOpenInvitations(project)]);
  return { members, invitations, currentUserId: user.id, roles: ROLES.map((role) => ({ value: role, label: roleLabel(role) })) };
}

const roleSchema = z.enum(ROLES, { error: "Choose one of the listed roles." });
const actionSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("invite"), email: emailSchema, role: roleSchema }),
  z.object({ intent: z.literal("change-role"), membershipId: z.coerce.number().int().positive(), role: roleSchema }),
  z.object({ intent: z.literal("remove"), membershipId: z.coerce.number().int().positive() }),
  z.object({ intent: z.literal("revoke"), invitationId: z.coerce.number().int().positive() }),
]);

export async function action({ request, params }: Route.ActionArgs) {
  const { project, user } = await requireRole(request, params.projectId, "members.manage");
  const parsed = parseForm(await readPageForm(request), actionSchema);
  if (!parsed.ok) return data({ intent: "invalid", errors: parsed.errors, notice: null }, { status: 400 });
  const ip = clientAddress(request);
  const input = parsed.data;
  try {
    if (input.intent === "invite") {
      await createInvitation(project, user, { email: input.email, role: input.role }, appOrigin(), ip);
      return { intent: input.intent, errors: {}, notice: `Invitation to ${input.email.trim().toLowerCase()} saved; its mail goes out now.` };
    }
    if (input.intent === "revoke") {
      const revoked = await revokeInvitation(project, user, input.invitationId, ip);
      const errors: Record<string, string> = revoked ? {} : { form: "That invitation is no longer open." };
      return { intent: input.intent, errors, notice: revoked ? "Invitation withdrawn." : null };
    }
    if (input.intent === "change-role") await changeMemberRole(project, user, input.membershipId, input.role, ip);
    else await removeMember(project, user, input.membershipId, ip);
    return { intent: input.intent, errors: {}, notice: input.intent === "remove" ? "Member removed." : "Role changed." };
  } catch (error) {
    // The model's refusal, shown beside the field it concerns (the e-mail of an invitation) or above the list.
    if (error instanceof DomainError) return data({ intent: input.intent, errors: { [input.intent === "invite" ? "email" : "form"]: error.message } as Record<string, string>, notice: null }, { status: 400 });
    throw error;
  }
}

/** Whether the invitation's mail went out; the outbox keeps retrying while the mail server is away. */
function InvitationMailState({ state }: { state: "pending" | "sent" | "failed" | null }) {
  if (state === "pending") return <span className="text-caution">mail not sent yet (retrying)</span>;
  if (state === "failed") return <span className="text-danger">mail could not be sent: withdraw and invite again</span>;
  return null;
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Members · Firmsand" }];
}

const selectClass = "rounded border border-line bg-panel px-2 py-1 focus:outline-2 focus:outline-lagoon";

export default function ProjectMembers({ loaderData, actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  const inviteErrors = actionData?.intent === "invite" || actionData?.intent === "invalid" ? errors : {};
  return (
    <div className="space-y-8">
      <ActionMessages error={errors.form} notice={actionData?.notice} />

      <section aria-labelledby="members-heading">
        <h2 id="members-heading" className="text-lg font-semibold">Members</h2>
        <table className="mt-3 w-full text-left text-sm">
          <thead>
            <tr className="border-b border-line"><th className="py-2">Name</th><th>E-mail</th><th>Role</th><th><span className="sr-only">Remove</span></th></tr>
          </thead>
          <tbody>
            {loaderData.members.map((member) => (
              <tr key={member.membershipId} className="border-b border-line">
                <td className="py-2 font-sans">{member.name}{member.userId === loaderData.currentUserId ? " (you)" : ""}</td>
                <td>{member.email}</td>
                <td>
                  <Form method="post" className="flex items-center gap-2">
                    <input type="hidden" name="membershipId" value={member.membershipId} />
                    <label className="sr-only" htmlFor={`role-${member.membershipId}`}>Role of {member.name}</label>
                    <select id={`role-${member.membershipId}`} name="role" defaultValue={member.role} className={selectClass}>
                      {loaderData.roles.map((role) => <option key={role.value} value={role.value}>{role.label}</option>)}
                    </select>
                    <SubmitButton tone="plain" intent="change-role" pendingLabel="Saving…" className="px-2 py-1 text-sm">Change role</SubmitButton>
                  </Form>
                </td>
                <td>
                  <ConfirmedActionForm
                    question={`Remove ${member.name} from this project?`}
                    intent="remove" fields={{ membershipId: member.membershipId }}
                    label="Remove" pendingLabel="Removing…" accessibleName={`Remove ${member.name}`} className="px-2 py-1 text-sm"
                  />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </section>

      <section aria-labelledby="invitations-heading">
        <h2 id="invitations-heading" className="text-lg font-semibold">Open invitations</h2>
        {loaderData.invitations.length === 0 ? (
          <p className="mt-2 text-sm text-muted">No open invitations.</p>
        ) : (
          <ul className="mt-2 space-y-2 text-sm">
            {loaderData.invitations.map((invitation) => (
              <li key={invitation.id} className="flex flex-wrap items-center gap-3 rounded border border-line bg-panel p-2">
                <span className="figures">{invitation.email}</span>
                <span>{roleLabel(invitation.role)}</span>
                <span className="text-muted">expires <time dateTime={invitation.expiresAt}>{invitation.expiresAt.slice(0, 10)}</time></span>
                <InvitationMailState state={invitation.mail} />
                <Form method="post" className="ml-auto">
                  <input type="hidden" name="invitationId" value={invitation.id} />
                  <SubmitButton tone="plain" intent="revoke" pendingLabel="Withdrawing…" className="px-2 py-1 text-sm">Withdraw</SubmitButton>
                </Form>
              </li>
            ))}
          </ul>
        )}
      </section>

      <section aria-labelledby="invite-heading" className="max-w-md">
        <h2 id="invite-heading" className="text-lg font-semibold">Invite someone</h2>
        <Form method="post" className="mt-3 space-y-4" noValidate>
          <TextField label="E-mail" name="email" type="email" required autoComplete="off" error={inviteErrors.email} />
          <div>
            <label htmlFor="invite-role" className="block text-sm font-medium">Role</label>
            <select id="invite-role" name="role" defaultValue="viewer" aria-describedby={inviteErrors.role ? "invite-role-error" : undefined} className={`mt-1 ${selectClass}`}>
              {loaderData.roles.map((role) => <option key={role.value} value={role.value}>{role.label}</option>)}
            </select>
            {inviteErrors.role ? <p id="invite-role-error" className="mt-1 text-sm text-danger">{inviteErrors.role}</p> : null}
          </div>
          <SubmitButton intent="invite" pendingLabel="Sending invitation…">Send invitation</SubmitButton>
        </Form>
      </section>
    </div>
  );
}
