import { Form, Link, data } from "react-router";
import { z } from "zod";
import { ConfirmedActionForm } from "~/components/confirmed-action-form";
import { ActionMessages } from "~/components/form-message";
import { Page } from "~/components/page";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { requireSiteAdmin } from "~/lib/auth/access.server";
import { roleLabel } from "~/lib/auth/roles";
import { DomainError } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { emailSchema, parseForm, personNameSchema } from "~/lib/http/form";
import { appOrigin } from "~/lib/http/origin.server";
import { ACCOUNTS_PER_PAGE, createAccount, listAccountPage, sendAccountPasswordReset, updateAccount } from "~/models/accounts.server";
import type { Route } from "./+types/admin.users";
import { readPageForm } from "~/lib/http/body.server";

// Every account (the site admin): disable or re-enable, allow or stop project creation, send a
// password-reset link, create an account that chooses its password through such a link.

// The list's place in the address: ?q=<name or e-mail>&page=<n>, so a search and a page can be linked.
const querySchema = z.object({
  q: z.string().catch("").transform((value) => value.slice(0, 200)),
  page: z.coerce.number().int().min(1).catch(1),
});

export async function loader({ request }: Route.LoaderArgs) {
  const user = await requireSiteAdmin(request);
  const params = new URL(request.url).searchParams;
  const query = querySchema.parse({ q: params.get("q") ?? "", page: params.get("page") ?? "1" });
  const list = await listAccountPage(user, query.q, query.page);
  return { ...list, perPage: ACCOUNTS_PER_PAGE, search: query.q, currentUserId: user.id };
}

const accountId = z.coerce.number().int().positive();
const actionSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("disable"), userId: accountId }),
  z.object({ intent: z.literal("enable"), userId: accountId }),
  z.object({ intent: z.literal("allow-projects"), userId: accountId }),
  z.object({ intent: z.literal("stop-projects"), userId: accountId }),
  z.object({ intent: z.literal("send-reset"), userId: accountId }),
  z.object({ intent: z.literal("create"), name: personNameSchema, email: emailSchema }),
]);

export async function action({ request }: Route.ActionArgs) {
  const user = await requireSiteAdmin(request);
  const parsed = parseForm(await readPageForm(request), actionSchema);
  if (!parsed.ok) return data({ intent: "invalid", errors: parsed.errors, notice: null }, { status: 400 });
  const ip = clientAddress(request);
  const input = parsed.data;
  try {
    if (input.intent === "create") {
      const created = await createAccount(user, input, appOrigin(), ip);
      return { intent: input.intent, errors: {}, notice: `Account created; ${created.email} was sent a link to choose a password.` };
    }
    if (input.intent === "send-reset") {
      const account = await sendAccountPasswordReset(user, input.userId, appOrigin(), ip);
      return { intent: input.intent, errors: {}, notice: `A password-reset link was sent to ${account.email}.` };
    }
    const patch = {
      disable: { disabled: true }, enable: { disabled: false },
      "allow-projects": { mayCreateProjects: true }, "stop-projects": { mayCreateProjects: false },
    }[input.intent];
    const account = await updateAccount(user, input.userId, patch, { ip });
    const notices = {
      disable: `${account.name} is disabled and signed out everywhere.`, enable: `${account.name} may sign in again.`,
      "allow-projects": `${account.name} may create projects.`, "stop-projects": `${account.name} may no longer create projects.`,
    };
    return { intent: input.intent, errors: {}, notice: notices[input.intent] };
  } catch (error) {
    if (error instanceof DomainError) {
      const field = input.intent === "create" && error.details[0]?.field === "email" ? "email" : "form";
      return data({ intent: input.intent, errors: { [field]: error.message } as Record<string, string>, notice: null }, { status: 400 });
    }
    throw error;
  }
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Accounts · Firmsand" }];
}

const smallButton = "px-2 py-1 text-sm";
const pageLinkClass = "rounded border border-line bg-panel px-3 py-2 text-sm font-medium hover:bg-paper focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-lagoon";

/** Which accounts of how many are shown, and links to the previous and next pages (the search kept). */
function Pager({ search, page, pages, total, perPage }: { search: string; page: number; pages: number; total: number; perPage: number }) {
  const href = (target: number) => `?${new URLSearchParams({ ...(search ? { q: search } : {}), page: String(target) })}`;
  const first = total === 0 ? 0 : (page - 1) * perPage + 1;
  const last = Math.min(total, page * perPage);
  return (
    <nav aria-label="Pages of accounts" className="flex flex-wrap items-center justify-between gap-2">
      <p className="text-sm" data-testid="account-count">
        {total === 0 ? "No accounts" : <>Accounts <span className="figures">{first.toLocaleString("en-US")}–{last.toLocaleString("en-US")}</span> of <span className="figures">{total.toLocaleString("en-US")}</span></>}
        {pages > 1 ? <> · page <span className="figures">{page}</span> of <span className="figures">{pages}</span></> : null}
      </p>
      <div className="flex gap-2">
        {page > 1 ? <Link className={pageLinkClass} to={href(page - 1)} rel="prev">← Previous page</Link> : null}
        {page < pages ? <Link className={pageLinkClass} to={href(page + 1)} rel="next">Next page →</Link> : null}
      </div>
    </nav>
  );
}

export default function AdminUsers({ loaderData, actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  const createErrors = actionData?.intent === "create" || actionData?.intent === "invalid" ? errors : {};
  return (
    <Page title="Accounts" wide>
      <div className="space-y-8">
      <ActionMessages error={errors.form} notice={actionData?.notice} />

      <Form method="get" role="search" className="flex items-end gap-2">
        <TextField label="Search by name or e-mail" name="q" defaultValue={loaderData.search} />
        <SubmitButton tone="plain" pendingLabel="Searching…">Search</SubmitButton>
      </Form>

      <table className="w-full text-left text-sm">
        <thead>
          <tr className="border-b border-line">
            <th className="py-2">Name</th><th>E-mail</th><th>Site admin</th><th>May create projects</th><th>Status</th><th>Last sign-in</th><th>Projects</th><th><span className="sr-only">Actions</span></th>
          </tr>
        </thead>
        <tbody>
          {loaderData.accounts.map((account) => {
            const self = account.id === loaderData.currentUserId;
            return (
              <tr key={account.id} className="border-b border-line align-top">
                <td className="py-2">{account.name}{self ? " (you)" : ""}</td>
                <td>{account.email}</td>
                <td>{account.isSiteAdmin ? "Yes" : "No"}</td>
                <td>{account.isSiteAdmin || account.mayCreateProjects ? "Yes" : "No"}</td>
                <td>{account.disabledAt ? <>Disabled <time dateTime={account.disabledAt}>{account.disabledAt.slice(0, 10)}</time></> : "Active"}</td>
                <td>{account.lastSignInAt ? <time dateTime={account.lastSignInAt}>{account.lastSignInAt.slice(0, 10)}</time> : "—"}</td>
                <td>
                  {account.memberships.length === 0 ? "—" : (
                    <ul>{account.memberships.map((m) => <li key={m.projectId}>{m.projectName} — {roleLabel(m.role)}</li>)}</ul>
                  )}
                </td>
                <td className="space-y-1 py-2">
                  {account.disabledAt ? (
                    <Form method="post">
                      <input type="hidden" name="userId" value={account.id} />
                      <SubmitButton tone="plain" intent="enable" pendingLabel="Re-enabling…" className={smallButton} aria-label={`Re-enable ${account.name}`}>Re-enable</SubmitButton>
                    </Form>
                  ) : self ? null : (
                    <ConfirmedActionForm
                      question={`Disable ${account.name}? They are signed out everywhere and their API tokens stop working until re-enabled.`}
                      intent="disable" fields={{ userId: account.id }}
                      label="Disable" pendingLabel="Disabling…" accessibleName={`Disable ${account.name}`} className={smallButton}
                    />
                  )}
                  {account.isSiteAdmin ? null : account.mayCreateProjects ? (
                    <ConfirmedActionForm
                      question={`Stop ${account.name} creating projects? Projects they already manage stay theirs.`}
                      intent="stop-projects" fields={{ userId: account.id }} tone="plain"
                      label="Stop creating projects" pendingLabel="Saving…" accessibleName={`Stop ${account.name} creating projects`} className={smallButton}
                    />
                  ) : (
                    <Form method="post">
                      <input type="hidden" name="userId" value={account.id} />
                      <SubmitButton tone="plain" intent="allow-projects" pendingLabel="Saving…" className={smallButton} aria-label={`Allow ${account.name} to create projects`}>Allow creating projects</SubmitButton>
                    </Form>
                  )}
                  <Form method="post">
                    <input type="hidden" name="userId" value={account.id} />
                    <SubmitButton tone="plain" intent="send-reset" pendingLabel="Sending…" className={smallButton} aria-label={`Send ${account.name} a password-reset link`}>Send reset link</SubmitButton>
                  </Form>
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
      {loaderData.accounts.length === 0 ? <p className="text-sm text-muted">No account matches.</p> : null}
      <Pager search={loaderData.search} page={loaderData.page} pages={loaderData.pages} total={loaderData.total} perPage={loaderData.perPage} />

      <section aria-labelledby="create-heading" className="max-w-md">
        <h2 id="create-heading" className="text-lg font-semibold">Create an account</h2>
        <p className="mt-1 text-sm text-muted">The new account is sent a link to choose its password; give it projects by invitation.</p>
        <Form method="post" className="mt-3 space-y-4" noValidate>
          <TextField label="Name" name="name" required autoComplete="off" error={createErrors.name} />
          <TextField label="E-mail" name="email" type="email" required autoComplete="off" error={createErrors.email} />
          <SubmitButton intent="create" pendingLabel="Creating…">Create the account</SubmitButton>
        </Form>
      </section>
      </div>
    </Page>
  );
}
