import { Form, data, redirect, useNavigation, useSearchParams } from "react-router";
import { FormMessage } from "~/components/form-message";
import { Page } from "~/components/page";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { getOptionalUser } from "~/lib/auth/access.server";
import { SignInError, authenticator } from "~/lib/auth/sign-in.server";
import { demoAccounts } from "~/lib/auth/demo-accounts.server";
import { getEnv } from "~/lib/settings/env.server";
import { safeNext, signIn } from "~/lib/auth/session.server";
import type { Route } from "./+types/login";
import { readPageForm, requestWithForm } from "~/lib/http/body.server";

export async function loader({ request }: Route.LoaderArgs) {
  const next = safeNext(new URL(request.url).searchParams.get("next"));
  if (await getOptionalUser(request)) throw redirect(next);
  return { demoAccounts: getEnv().DEMO_MODE ? demoAccounts() : null };
}

export async function action({ request }: Route.ActionArgs) {
  const form = await readPageForm(request);
  const next = safeNext(form.get("next"));
  try {
    // The strategy reads the body itself: it gets the form already read within its limit.
    const user = await authenticator.authenticate("form", requestWithForm(request, form));
    return signIn(request, user.id, next);
  } catch (error) {
    if (error instanceof SignInError) {
      return data({ error: error.message, field: error.field, email: String(form.get("email") ?? "") }, { status: 400 });
    }
    throw error;
  }
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Sign in · Firmsand" }];
}

export default function Login({ loaderData, actionData }: Route.ComponentProps) {
  const [searchParams] = useSearchParams();
  const navigation = useNavigation();
  const error = actionData?.error ?? null;
  return (
    <Page title="Sign in">
      <Form method="post" className="space-y-4" aria-describedby={error ? "sign-in-error" : undefined} noValidate>
        <input type="hidden" name="next" value={searchParams.get("next") ?? ""} />
        <FormMessage id="sign-in-error" tone="error">{error}</FormMessage>
        {searchParams.get("reset") === "done" && !error ? <FormMessage tone="success">Your password was changed. Sign in with the new one.</FormMessage> : null}
        <TextField
          label="E-mail"
          name="email"
          type="email"
          autoComplete="username"
          required
          defaultValue={actionData?.email}
          error={actionData?.field === "email" ? error : null}
        />
        <TextField
          label="Password"
          name="password"
          type="password"
          autoComplete="current-password"
          required
          error={actionData?.field === "password" ? error : null}
        />
        <div className="flex items-center gap-4">
          <SubmitButton pendingLabel="Signing in…">Sign in</SubmitButton>
          <a className="text-sm text-lagoon underline" href="/forgot-password">Forgot your password?</a>
        </div>
        {navigation.state === "submitting" ? <p className="sr-only" role="status">Signing in</p> : null}
      </Form>
      {loaderData.demoAccounts ? (
        <section aria-labelledby="demo-accounts" className="mt-10 rounded border border-line bg-panel p-4">
          <h2 id="demo-accounts" className="font-semibold">Demo accounts</h2>
          <p className="mt-1 text-sm text-muted">
            This is a demo. Every account below uses the password <code>firmsand-demo</code>.
          </p>
          <table className="mt-3 w-full text-left text-sm">
            <thead><tr><th className="py-1">E-mail</th><th className="py-1">Role</th></tr></thead>
            <tbody>
              {loaderData.demoAccounts.map((account) => (
                <tr key={account.email} className="border-t border-line">
                  <td className="py-1">{account.email}</td>
                  <td className="py-1">{account.role}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      ) : null}
    </Page>
  );
}
