import { Form, data } from "react-router";
import { z } from "zod";
import { FormMessage } from "~/components/form-message";
import { Page } from "~/components/page";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { clientAddress } from "~/lib/http/client-address.server";
import { roleLabel } from "~/lib/auth/roles";
import { newPasswordSchema, parseForm, personNameSchema } from "~/lib/http/form";
import { signIn } from "~/lib/auth/session.server";
import { acceptInvitation, lookUpInvitation } from "~/models/invitation.server";
import type { Route } from "./+types/invite.$token";
import { readPageForm } from "~/lib/http/body.server";
import { recordLoginAttempt, signInLockout } from "~/lib/auth/sign-in-throttle.server";
import { isKnownDevice } from "~/lib/auth/known-device.server";
import { findUserByEmail } from "~/lib/auth/users.server";

// Open to anyone holding the link: the token itself is the credential.
const CLOSED_MESSAGES = {
  expired: "This invitation has expired. Ask the project manager to send a new one.",
  used: "This invitation has already been used or was withdrawn. Sign in, or ask the project manager for a new one.",
  unknown: "This invitation link is not valid. Check that you copied the whole link.",
} as const;

export async function loader({ params }: Route.LoaderArgs) {
  const lookup = await lookUpInvitation(params.token);
  if (lookup.status !== "open") return { open: false as const, message: CLOSED_MESSAGES[lookup.status] };
  const { invitation } = lookup;
  return {
    open: true as const,
    email: invitation.email,
    roleLabel: roleLabel(invitation.role),
    projectName: invitation.projectName,
    hasAccount: invitation.hasAccount,
  };
}

const newAccountSchema = z.object({ name: personNameSchema, password: newPasswordSchema });
const existingAccountSchema = z.object({ password: z.string().min(1, "Enter your password.") });

export async function action({ request, params }: Route.ActionArgs) {
  const lookup = await lookUpInvitation(params.token);
  if (lookup.status !== "open") return data({ errors: { form: CLOSED_MESSAGES[lookup.status] } as Record<string, string> }, { status: 410 });
  const formData = await readPageForm(request);
  const parsed = lookup.invitation.hasAccount
    ? parseForm(formData, existingAccountSchema.transform((value) => ({ ...value, name: "" })))
    : parseForm(formData, newAccountSchema);
  if (!parsed.ok) return data({ errors: parsed.errors }, { status: 400 });
  const ip = clientAddress(request);
  // An existing account's password is checked here too: throttled exactly as sign-in is.
  const throttled = lookup.invitation.hasAccount ? await invitePasswordLockout(request, lookup.invitation.email, ip) : null;
  if (throttled) return data({ errors: { password: throttled } as Record<string, string> }, { status: 429 });
  const result = await acceptInvitation(params.token, parsed.data, ip);
  if (!result.ok) {
    if (result.reason === "wrong-password") {
      await recordLoginAttempt(lookup.invitation.email, ip, false);
      return data({ errors: { password: "That is not the password of this account." } as Record<string, string> }, { status: 400 });
    }
    return data({ errors: { form: CLOSED_MESSAGES[result.reason] } as Record<string, string> }, { status: 410 });
  }
  return signIn(request, result.user.id, `/projects/${result.projectId}`);
}

/** The sign-in lock for the invited account's address, sparing a browser it signed in from before; null when not locked. */
async function invitePasswordLockout(request: Request, email: string, ip: string): Promise<string | null> {
  const user = await findUserByEmail(email);
  const lockout = await signInLockout(email, ip, new Date(), user ? await isKnownDevice(request, user.id) : false);
  return lockout?.message ?? null;
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Invitation · Firmsand" }];
}

export default function Invite({ loaderData, actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  if (!loaderData.open) {
    return (
      <Page title="Invitation">
        <FormMessage tone="error">{loaderData.message}</FormMessage>
        <p className="mt-4"><a className="text-lagoon underline" href="/login">Go to sign in</a></p>
      </Page>
    );
  }
  return (
    <Page title={`Join ${loaderData.projectName}`}>
      <p>You are invited as <strong>{loaderData.roleLabel}</strong> with the address <span className="figures">{loaderData.email}</span>.</p>
      <Form method="post" className="mt-6 space-y-4" noValidate>
        <FormMessage tone="error">{errors.form}</FormMessage>
        {loaderData.hasAccount ? (
          <TextField label="Your current password" name="password" type="password" autoComplete="current-password" required error={errors.password}
            hint="You already have a Firmsand account: confirm it with your password." />
        ) : (
          <>
            <TextField label="Your name" name="name" autoComplete="name" required error={errors.name} />
            <TextField label="Choose a password" name="password" type="password" autoComplete="new-password" required error={errors.password}
              hint="At least 10 characters." />
          </>
        )}
        <SubmitButton pendingLabel="Joining…">Join the project</SubmitButton>
      </Form>
    </Page>
  );
}
