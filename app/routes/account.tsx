import { Form, data } from "react-router";
import { z } from "zod";
import { FormMessage } from "~/components/form-message";
import { ConfirmedActionForm } from "~/components/confirmed-action-form";
import { Page } from "~/components/page";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { requireUser } from "~/lib/auth/access.server";
import { auditForAccount } from "~/lib/auth/sign-in.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { describeUserAgent } from "~/lib/http/user-agent";
import { newPasswordSchema, parseForm, personNameSchema } from "~/lib/http/form";
import { AUDIT_ACTIONS } from "~/lib/audit/audit.server";
import { changeOwnPassword, updateOwnName } from "~/lib/auth/users.server";
import { currentSignInSession, endSessions, listSessions } from "~/lib/auth/session.server";
import { createApiToken, listApiTokens, revokeApiToken } from "~/lib/auth/api-token.server";
import { API_TOKEN_SCOPES } from "~/lib/db.server";
import type { Route } from "./+types/account";
import { readPageForm } from "~/lib/http/body.server";

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireUser(request);
  return { name: user.name, email: user.email, tokens: await listApiTokens(user), sessions: await listSessions(user.id, request) };
}

/** Days until a new token expires, or never; 90 days unless its owner says otherwise. */
const TOKEN_EXPIRIES = ["30", "90", "365", "never"] as const;

const schema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("name"), name: personNameSchema }),
  z
    .object({ intent: z.literal("password"), currentPassword: z.string().min(1, "Enter your current password."), newPassword: newPasswordSchema, confirm: z.string() })
    .refine((value) => value.newPassword === value.confirm, { path: ["confirm"], message: "The two passwords differ." }),
  z.object({
    intent: z.literal("create-token"),
    tokenName: z.string().trim().min(1, "Name the token after what will use it.").max(120, "At most 120 characters."),
    tokenScope: z.enum(API_TOKEN_SCOPES, { message: "Choose read-only or read and write." }),
    tokenExpiry: z.enum(TOKEN_EXPIRIES, { message: "Choose when the token expires." }),
  }),
  z.object({ intent: z.literal("revoke-token"), tokenId: z.coerce.number().int().positive() }),
  z.object({ intent: z.literal("sign-out-elsewhere") }),
]);

type ActionResult = { intent: string; errors: Record<string, string>; notice: string | null; newToken?: string };

export async function action({ request }: Route.ActionArgs) {
  const user = await requireUser(request);
  const formData = await readPageForm(request);
  const intent = String(formData.get("intent") ?? "");
  const parsed = parseForm(formData, schema);
  if (!parsed.ok) return data({ intent, errors: parsed.errors, notice: null }, { status: 400 });
  if (parsed.data.intent === "name") {
    await updateOwnName(user, parsed.data.name);
    return { intent, errors: {} as Record<string, string>, notice: "Name saved." };
  }
  if (parsed.data.intent === "create-token") {
    const { tokenName, tokenScope, tokenExpiry } = parsed.data;
    const { token, view } = await createApiToken(user, tokenName, { scope: tokenScope, expiresInDays: tokenExpiry === "never" ? null : Number(tokenExpiry) });
    await auditForAccount(user.id, AUDIT_ACTIONS.apiTokenCreated, clientAddress(request), { tokenId: view.id, name: view.name, scope: view.scope, expiresAt: view.expiresAt });
    return { intent, errors: {}, notice: `Token "${view.name}" created. Copy it now: it is shown only once.`, newToken: token } satisfies ActionResult;
  }
  if (parsed.data.intent === "revoke-token") {
    const revoked = await revokeApiToken(user, parsed.data.tokenId);
    if (!revoked) return data({ intent, errors: { tokenId: "That token is not yours or was already revoked." }, notice: null } satisfies ActionResult, { status: 404 });
    await auditForAccount(user.id, AUDIT_ACTIONS.apiTokenRevoked, clientAddress(request), { tokenId: parsed.data.tokenId });
    return { intent, errors: {}, notice: "Token revoked: programs using it are refused from now on." } satisfies ActionResult;
  }
  const current = await currentSignInSession(request);
  if (parsed.data.intent === "sign-out-elsewhere") {
    const ended = await endSessions(user.id, "signed-out-elsewhere", { except: current?.id ?? null });
    await auditForAccount(user.id, AUDIT_ACTIONS.signOut, clientAddress(request), { elsewhere: ended });
    return { intent, errors: {}, notice: ended === 0 ? "You were signed in nowhere else." : `Signed out of ${ended} other browser${ended === 1 ? "" : "s"}.` } satisfies ActionResult;
  }
  const outcome = await changeOwnPassword(user, parsed.data.currentPassword, parsed.data.newPassword, current?.id ?? null);
  if (outcome === "wrong-password") return data({ intent, errors: { currentPassword: "That is not your current password." } as Record<string, string>, notice: null }, { status: 400 });
  await auditForAccount(user.id, AUDIT_ACTIONS.passwordChanged, clientAddress(request), {});
  return { intent, errors: {} as Record<string, string>, notice: "Password changed. Any other browser signed in as you has been signed out." };
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Your account · Firmsand" }];
}

export default function Account({ loaderData, actionData }: Route.ComponentProps) {
  const result = actionData as ActionResult | undefined;
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
      <ApiTokens tokens={loaderData.tokens} newToken={result?.newToken} errors={result?.intent === "create-token" || result?.intent === "revoke-token" ? errors : {}} />
      <SignedInBrowsers sessions={loaderData.sessions} />
    </Page>
  );
}

type SessionRow = Route.ComponentProps["loaderData"]["sessions"][number];

/** Where the user is signed in, with a way to end every session but this one. */
function SignedInBrowsers({ sessions }: { sessions: SessionRow[] }) {
  const others = sessions.filter((session) => !session.current).length;
  return (
    <section className="mt-10" aria-labelledby="sessions-heading">
      <h2 id="sessions-heading" className="text-lg font-semibold">Signed-in browsers</h2>
      <p className="mt-1 text-sm text-muted">Each browser where you signed in. Signing out, changing your password or resetting it ends sessions; a lost phone or a shared computer is ended here.</p>
      <table className="mt-4 w-full text-sm" data-testid="sessions">
        <thead><tr className="text-left text-muted"><th className="py-1">Browser</th><th className="pl-2">Signed in (UTC)</th><th className="pl-2">Last used (UTC)</th></tr></thead>
        <tbody>
          {sessions.map((session) => (
            <tr key={session.id} className="border-t border-line">
              <td className="py-2 font-sans" title={session.userAgent}>{describeUserAgent(session.userAgent)}{session.current ? <strong className="ml-2">(this browser)</strong> : null}</td>
              <td className="whitespace-nowrap pl-2">{session.startedAt.slice(0, 16).replace("T", " ")}</td>
              <td className="whitespace-nowrap pl-2">{session.lastSeenAt.slice(0, 16).replace("T", " ")}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {others > 0 ? (
        <div className="mt-3">
          <ConfirmedActionForm
            question={`Sign out the ${others} other browser${others === 1 ? "" : "s"}? They will need your password again.`}
            intent="sign-out-elsewhere" fields={{}} tone="plain"
            label="Sign out everywhere else" pendingLabel="Signing out…"
          />
        </div>
      ) : null}
    </section>
  );
}

type TokenRow = Route.ComponentProps["loaderData"]["tokens"][number];

const selectClass = "rounded border border-line bg-panel px-2 py-2 focus:outline-2 focus:outline-lagoon";

/** An expiry date, marked when it has passed (the token then signs nobody in). */
function TokenExpiry({ expiresAt }: { expiresAt: string }) {
  const expired = new Date(expiresAt).getTime() <= Date.now();
  return <span className={expired ? "text-danger" : undefined}>{expiresAt.slice(0, 10)}{expired ? " (expired)" : ""}</span>;
}

/** Personal API tokens for scripts that upload surveys (`Authorization: Bearer <token>`). */
function ApiTokens({ tokens, newToken, errors }: { tokens: TokenRow[]; newToken?: string; errors: Record<string, string> }) {
  const active = tokens.filter((token) => !token.revokedAt);
  return (
    <section className="mt-10" aria-labelledby="api-tokens">
      <h2 id="api-tokens" className="text-lg font-semibold">API tokens</h2>
      <p className="mt-1 text-sm text-muted">
        A token lets a program act as you on the API (for example an upload script in the survey office), with your roles.
        Send it as <code>Authorization: Bearer &lt;token&gt;</code>. Revoke a token you no longer use.
      </p>
      {newToken ? (
        <div className="mt-4 rounded border border-ok bg-panel p-3" role="status">
          <p className="text-sm font-medium">Your new token (shown only this once):</p>
          <code data-testid="new-api-token" className="mt-1 block break-all text-sm">{newToken}</code>
        </div>
      ) : null}
      <Form method="post" className="mt-4 flex flex-wrap items-end gap-3" noValidate>
        <div className="grow"><TextField label="Token name" name="tokenName" required error={errors.tokenName} hint="What will use it, e.g. “office upload script”." /></div>
        <div>
          <label htmlFor="token-scope" className="block text-sm font-medium">May</label>
          <select id="token-scope" name="tokenScope" defaultValue="read-write" className={`mt-1 ${selectClass}`}>
            <option value="read-write">read and change (uploads, plans)</option>
            <option value="read-only">read only (reports, dashboards)</option>
          </select>
          {errors.tokenScope ? <p className="mt-1 text-sm text-danger">{errors.tokenScope}</p> : null}
        </div>
        <div>
          <label htmlFor="token-expiry" className="block text-sm font-medium">Expires</label>
          <select id="token-expiry" name="tokenExpiry" defaultValue="90" className={`mt-1 ${selectClass}`}>
            <option value="30">in 30 days</option>
            <option value="90">in 90 days</option>
            <option value="365">in a year</option>
            <option value="never">never (until revoked)</option>
          </select>
          {errors.tokenExpiry ? <p className="mt-1 text-sm text-danger">{errors.tokenExpiry}</p> : null}
        </div>
        <SubmitButton intent="create-token" pendingLabel="Creating…">Create token</SubmitButton>
      </Form>
      {errors.tokenId ? <p className="mt-2 text-sm text-danger" role="alert">{errors.tokenId}</p> : null}
      {active.length === 0 ? (
        <p className="mt-4 text-sm text-muted">You have no active tokens.</p>
      ) : (
        <table className="mt-4 w-full text-sm">
          <thead><tr className="text-left text-muted"><th className="py-1">Name</th><th>May</th><th>Created</th><th>Expires</th><th>Last used</th><th><span className="sr-only">Revoke</span></th></tr></thead>
          <tbody>
            {active.map((token) => (
              <tr key={token.id} className="border-t border-line">
                <td className="py-2 font-sans">{token.name}</td>
                <td className="font-sans">{token.scope === "read-only" ? "read only" : "read and change"}</td>
                <td>{token.createdAt.slice(0, 10)}</td>
                <td>{token.expiresAt ? <TokenExpiry expiresAt={token.expiresAt} /> : "never"}</td>
                <td>{token.lastUsedAt ? token.lastUsedAt.slice(0, 16).replace("T", " ") : "never"}</td>
                <td className="text-right">
                  <ConfirmedActionForm
                    question={`Revoke "${token.name}"? Programs using it will be refused. This cannot be undone.`}
                    intent="revoke-token" fields={{ tokenId: token.id }} tone="plain"
                    label="Revoke" pendingLabel="Revoking…" accessibleName={`Revoke ${token.name}`}
                  />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
