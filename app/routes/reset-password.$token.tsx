import { Form, data, redirect } from "react-router";
import { z } from "zod";
import { FormMessage } from "~/components/form-message";
import { Page } from "~/components/page";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { clientAddress } from "~/lib/http/client-address.server";
import { newPasswordSchema, parseForm } from "~/lib/http/form";
import { lookUpPasswordReset, resetPassword } from "~/models/password-reset.server";
import type { Route } from "./+types/reset-password.$token";
import { readPageForm } from "~/lib/http/body.server";

// Open to anyone holding the link: the token itself is the credential.
const CLOSED_MESSAGES = {
  expired: "This reset link has expired. Ask for a new one.",
  used: "This reset link has already been used. Ask for a new one if you still need it.",
  unknown: "This reset link is not valid. Check that you copied the whole link.",
} as const;

export async function loader({ params }: Route.LoaderArgs) {
  const status = await lookUpPasswordReset(params.token);
  return status === "open" ? { open: true as const, message: null } : { open: false as const, message: CLOSED_MESSAGES[status] };
}

const schema = z
  .object({ password: newPasswordSchema, confirm: z.string() })
  .refine((value) => value.password === value.confirm, { path: ["confirm"], message: "The two passwords differ." });

export async function action({ request, params }: Route.ActionArgs) {
  const parsed = parseForm(await readPageForm(request), schema);
  if (!parsed.ok) return data({ errors: parsed.errors }, { status: 400 });
  const result = await resetPassword(params.token, parsed.data.password, clientAddress(request));
  if (!result.ok) return data({ errors: { form: CLOSED_MESSAGES[result.reason] } as Record<string, string> }, { status: 410 });
  return redirect("/login?reset=done");
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Choose a new password · Firmsand" }];
}

export default function ResetPassword({ loaderData, actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  return (
    <Page title="Choose a new password">
      {!loaderData.open ? (
        <>
          <FormMessage tone="error">{loaderData.message}</FormMessage>
          <p className="mt-4"><a className="text-lagoon underline" href="/forgot-password">Ask for a new link</a></p>
        </>
      ) : (
        <Form method="post" className="space-y-4" noValidate>
          <FormMessage tone="error">{errors.form}</FormMessage>
          <TextField label="New password" name="password" type="password" autoComplete="new-password" required error={errors.password} hint="At least 10 characters." />
          <TextField label="New password again" name="confirm" type="password" autoComplete="new-password" required error={errors.confirm} />
          <SubmitButton pendingLabel="Saving…">Set the new password</SubmitButton>
        </Form>
      )}
    </Page>
  );
}
