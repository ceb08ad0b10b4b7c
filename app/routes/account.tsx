import { Form, data } from "react-router";
import { z } from "zod";
import { FormMessage } from "~/components/form-message";
import { Page } from "~/components/page";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { requireUser } from "~/lib/access.server";
import { auditForAccount } from "~/lib/auth.server";
import { clientAddress } from "~/lib/client-address.server";
import { newPasswordSchema, parseForm, personNameSchema } from "~/lib/form";
import { AUDIT_ACTIONS } from "~/models/audit.server";
import { changeOwnPassword, updateOwnName } from "~/models/user.server";
import type { Route } from "./+types/account";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return { name: user.name, email: user.email };
}

const schema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("name"), name: personNameSchema }),
  z
    .object({ intent: z.literal("password"), currentPassword: z.string().min(1, "Enter your current password."), newPassword: newPasswordSchema, confirm: z.string() })
    .refine((value) => value.newPassword === value.confirm, { path: ["confirm"], message: "The two passwords differ." }),
]);

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request);
  const formData = await request.formData();
  const intent = String(formData.get("intent") ?? "");
  const parsed = parseForm(formData, schema);
  if (!parsed.ok) return data({ intent, errors: parsed.errors, notice: null }, { status: 400 });
  if (parsed.data.intent === "name") {
    await updateOwnName(user, parsed.data.name);
    return { intent, errors: {} as Record<string, string>, notice: "Name saved." };
  }
  const outcome = await changeOwnPassword(user, parsed.data.currentPassword, parsed.data.newPassword);
  if (outcome === "wrong-password") return data({ intent, errors: { currentPassword: "That is not your current password." } as Record<string, string>, notice: null }, { status: 400 });
  await auditForAccount(user.id, AUDIT_ACTIONS.passwordChanged, clientAddress(request), {});
  return { intent, errors: {} as Record<string, string>, notice: "Password changed." };
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Your account · Firmsand" }];
}

export default function Account({ loaderData, actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  const nameErrors = actionData?.intent === "name" ? errors : {};
  const passwordErrors = actionData?.intent === "password" ? errors : {};
  return (
    <Page title="Your account">
      <p className="text-sm text-muted">Signed in as <span className="figures">{loaderData.email}</span></p>
      <div aria-live="polite" className="mt-4"><FormMessage tone="success">{actionData?.notice}</FormMessage></div>
      <Form method="post" className="mt-6 space-y-4" noValidate>
        <h2 className="text-lg font-semibold">Name</h2>
        <TextField label="Your name" name="name" autoComplete="name" required defaultValue={loaderData.name} error={nameErrors.name} />
        <SubmitButton intent="name" pendingLabel="Saving…">Save name</SubmitButton>
      </Form>
      <Form method="post" className="mt-10 space-y-4" noValidate>
        <h2 className="text-lg font-semibold">Password</h2>
        <TextField label="Current password" name="currentPassword" type="password" autoComplete="current-password" required error={passwordErrors.currentPassword} />
        <TextField label="New password" name="newPassword" type="password" autoComplete="new-password" required error={passwordErrors.newPassword} hint="At least 10 characters." />
        <TextField label="New password again" name="confirm" type="password" autoComplete="new-password" required error={passwordErrors.confirm} />
        <SubmitButton intent="password" pendingLabel="Changing…">Change password</SubmitButton>
      </Form>
    </Page>
  );
}
