import { Form, data } from "react-router";
import { z } from "zod";
import { FormMessage } from "~/components/form-message";
import { Page } from "~/components/page";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { clientAddress } from "~/lib/http/client-address.server";
import { emailSchema, parseForm } from "~/lib/http/form";
import { appOrigin } from "~/lib/http/origin.server";
import { requestPasswordReset } from "~/models/password-reset.server";
import { TooManyRequestsError } from "~/lib/errors";
import type { Route } from "./+types/forgot-password";
import { readPageForm } from "~/lib/http/body.server";

// Public: anyone may ask; the answer is the same whether or not the address has an account.
export async function loader({}: Route.LoaderArgs) {
  return {};
}

const schema = z.object({ email: emailSchema });

export async function action({ request }: Route.ActionArgs) {
  const parsed = parseForm(await readPageForm(request), schema);
  if (!parsed.ok) return data({ errors: parsed.errors, sent: false }, { status: 400 });
  try {
    await requestPasswordReset(parsed.data.email, appOrigin(), clientAddress(request));
  } catch (error) {
    if (error instanceof TooManyRequestsError) return data({ errors: { form: error.message } as Record<string, string>, sent: false }, { status: 429 });
    throw error;
  }
  return { errors: {} as Record<string, string>, sent: true };
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Forgot password · Firmsand" }];
}

export default function ForgotPassword({ actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  return (
    <Page title="Reset your password">
      {actionData?.sent ? (
        <FormMessage tone="success">If that address has a Firmsand account, a reset link is on its way. The link works once, for one hour.</FormMessage>
      ) : (
        <Form method="post" className="space-y-4" noValidate>
          <FormMessage tone="error">{errors.form ?? null}</FormMessage>
          <TextField label="E-mail" name="email" type="email" autoComplete="username" required error={errors.email} />
          <SubmitButton pendingLabel="Sending…">Send a reset link</SubmitButton>
        </Form>
      )}
      <p className="mt-6"><a className="text-lagoon underline" href="/login">Back to sign in</a></p>
    </Page>
  );
}
