import { useRef } from "react";
import { Form, data } from "react-router";
import { z } from "zod";
import { ActionMessages } from "~/components/form-message";
import { ConfirmedActionForm } from "~/components/confirmed-action-form";
import { CopyButton } from "~/components/copy-button";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { requireRole } from "~/lib/auth/access.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { parseForm } from "~/lib/http/form";
import { appOrigin } from "~/lib/http/origin.server";
import { createShareLink, listShareLinks, revokeShareLink, shareLinkFormSchema, updateShareLink } from "~/models/share-links.server";
import type { Route } from "./+types/projects.$projectId.share";
import { readPageForm } from "~/lib/http/body.server";

// Outreach staff (and the manager) publish the public progress page: create a named link with a
// short public text, edit the text, revoke the link. The token is shown once, right after creation.

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId, "share-links.manage");
  return { projectId: project.id, links: await listShareLinks(project) };
}

const idSchema = z.coerce.number().int().positive();
const actionSchema = z.discriminatedUnion("intent", [
  shareLinkFormSchema.extend({ intent: z.literal("create") }),
  shareLinkFormSchema.extend({ intent: z.literal("update"), shareLinkId: idSchema }),
  z.object({ intent: z.literal("revoke"), shareLinkId: idSchema }),
]);

export async function action({ request, params }: Route.ActionArgs) {
  const { project, user } = await requireRole(request, params.projectId, "share-links.manage");
  const parsed = parseForm(await readPageForm(request), actionSchema);
  if (!parsed.ok) return data({ intent: "invalid", errors: parsed.errors, notice: null, created: null }, { status: 400 });
  const input = parsed.data;
  const ip = clientAddress(request);
  if (input.intent === "create") {
    const created = await createShareLink(project, user, { name: input.name, publicText: input.publicText }, appOrigin(), ip);
    return { intent: input.intent, errors: {}, notice: `Link “${input.name}” created. Copy it now: it is shown only once.`, created: { url: created.url, name: input.name } };
  }
  const done = input.intent === "update"
    ? await updateShareLink(project, user, input.shareLinkId, { name: input.name, publicText: input.publicText }, ip)
    : await revokeShareLink(project, user, { id: input.shareLinkId }, ip);
  if (!done) return data({ intent: input.intent, errors: { form: "That link is already revoked or does not exist." }, notice: null, created: null }, { status: 404 });
  return { intent: input.intent, errors: {}, notice: input.intent === "revoke" ? "Link revoked: it now answers “not found”." : "Link updated.", created: null };
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Share progress · Firmsand" }];
}

function embedSnippet(url: string): string {
  return `<iframe src="${url}" title="Restoration progress" width="100%" height="720" style="border:0;max-width:960px" loading="lazy" referrerpolicy="no-referrer"></iframe>`;
}

const areaClass = "mt-1 block w-full rounded border border-line bg-panel px-3 py-2 focus:outline-2 focus:outline-offset-1 focus:outline-lagoon";

export default function ProjectShare({ loaderData, actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  const created = actionData?.created ?? null;
  // The create form is emptied once a link is made (a new key remounts it); a refused form keeps what was typed.
  const formKey = useRef("create");
  if (created) formKey.current = created.url;
  return (
    <div className="space-y-8">
      <ActionMessages error={errors.form} notice={actionData?.notice} />
      {created ? (
        <section aria-labelledby="new-link" className="rounded border border-lagoon bg-panel p-4">
          <h2 id="new-link" className="font-semibold">New link: {created.name}</h2>
          <p className="mt-2 text-sm">Public address (anyone with it can see zone-level progress, nothing else):</p>
          <div className="mt-1 flex flex-wrap items-center gap-2">
            <a className="figures break-all text-sm underline" href={created.url} data-testid="share-url">{created.url}</a>
            <CopyButton text={created.url} label="Copy the public address" />
          </div>
          <p className="mt-3 text-sm">To embed it in an agency web page, paste this where the map should appear:</p>
          {/* Wrapped, never cut off: the whole snippet is visible and can be read before it is copied. */}
          <pre className="mt-1 whitespace-pre-wrap break-all rounded bg-paper p-2 text-xs" data-testid="embed-snippet">{embedSnippet(created.url)}</pre>
          <CopyButton text={embedSnippet(created.url)} label="Copy the embed code" className="mt-2" />
        </section>
      ) : null}

      <section aria-labelledby="create-heading">
        <h2 id="create-heading" className="text-lg font-semibold">Create a public progress link</h2>
        <p className="mt-1 text-sm text-muted">
          The public page shows the work limit, the zones coloured by percent complete, the percent complete, the volume removed and the date of the
          latest survey, with your text. It never shows cells, finds, people, dive plans, permits, water quality or survey files.
        </p>
        <Form method="post" className="mt-3 max-w-xl space-y-3" key={formKey.current} data-testid="create-link-form">
          <TextField label="Link name" name="name" required maxLength={120} error={actionData?.intent !== "update" ? errors.name : null} hint="For your own list, e.g. the web page it is for." />
          <div>
            <label htmlFor="public-text" className="block text-sm font-medium">Public text</label>
            <textarea id="public-text" name="publicText" rows={3} maxLength={600} className={areaClass} />
          </div>
          <SubmitButton intent="create" pendingLabel="Creating…">Create link</SubmitButton>
        </Form>
      </section>

      <section aria-labelledby="links-heading">
        <h2 id="links-heading" className="text-lg font-semibold">Links</h2>
        {loaderData.links.length === 0 ? <p className="mt-2 text-sm text-muted">No links yet.</p> : null}
        <ul className="mt-3 space-y-4">
          {loaderData.links.map((link) => (
            <li key={link.id} className="rounded border border-line bg-panel p-3" data-testid="share-link">
              <p className="font-medium">{link.name} {link.revokedAt ? <span className="text-sm text-danger">revoked {link.revokedAt.slice(0, 10)}</span> : <span className="text-sm text-ok">live</span>}</p>
              <p className="text-xs text-muted">Created <span className="figures">{link.createdAt.slice(0, 10)}</span>{link.createdBy ? ` by ${link.createdBy}` : ""}</p>
              {link.revokedAt ? null : (
                <div className="mt-2 flex flex-wrap items-end gap-4">
                  <Form method="post" className="flex-1 space-y-2">
                    <input type="hidden" name="shareLinkId" value={link.id} />
                    <TextField label="Link name" name="name" defaultValue={link.name} required maxLength={120} />
                    <div>
                      <label htmlFor={`text-${link.id}`} className="block text-sm font-medium">Public text</label>
                      <textarea id={`text-${link.id}`} name="publicText" rows={2} maxLength={600} defaultValue={link.publicText} className={areaClass} />
                    </div>
                    <SubmitButton intent="update" tone="plain" pendingLabel="Saving…">Save text</SubmitButton>
                  </Form>
                  <ConfirmedActionForm
                    question={`Revoke "${link.name}"? Its public address stops working at once, including where a page embeds it. This cannot be undone.`}
                    intent="revoke" fields={{ shareLinkId: link.id }}
                    label="Revoke" pendingLabel="Revoking…" accessibleName={`Revoke ${link.name}`}
                  />
                </div>
              )}
            </li>
          ))}
        </ul>
      </section>
    </div>
  );
}
