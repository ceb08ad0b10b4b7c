import { useState } from "react";
import { Form, data, redirect } from "react-router";
import { z } from "zod";
import {
  FIND_CATEGORIES, FIND_CATEGORY_LABELS, HOLD_CATEGORIES, HUMAN_REMAINS_DEFERENCE, HUMAN_REMAINS_PROTOCOL, type FindCategory,
} from "../../shared/finds/finds";
import { ActionMessages } from "~/components/form-message";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { requireRole } from "~/lib/auth/access.server";
import { DomainError, detailsOf } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { fieldErrorsFrom } from "~/lib/http/form";
import { findFormOptions, findInputSchema, logFind, positionFromFields } from "~/models/finds.server";
import { ProvenienceFields } from "~/components/finds/provenience-fields";
import { formFields, positionErrorsOnFields, positionFieldsSchema, prefillSchema, provenienceFromForm } from "~/components/finds/provenience";
import type { Route } from "./+types/projects.$projectId.finds.new";
import { readPageForm } from "~/lib/http/body.server";

// Log a find, on a phone at the dock as well as at a desk: what it is, where and when it came up,
// who found it. A cultural find or human remains places a stop-work hold as it is saved; the
// human-remains protocol shows the moment that category is chosen.

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId, "finds.log");
  return findFormOptions(project, prefillSchema.parse(Object.fromEntries(new URL(request.url).searchParams)));
}

/** Form fields → the API's input shape; empty fields are absent. */
function inputFromForm(form: FormData, timeZone: string) {
  const { text, number } = formFields(form);
  return {
    ...provenienceFromForm(form, timeZone),
    category: text("category"), description: text("description"), material: text("material"), count: number("count"),
    taxon: text("taxon"), element: text("element"),
  };
}

export async function action({ request, params }: Route.ActionArgs) {
  const { project, user } = await requireRole(request, params.projectId, "finds.log");
  const form = await readPageForm(request);
  const fields = Object.fromEntries([...form].filter((entry): entry is [string, string] => typeof entry[1] === "string"));
  const place = positionFieldsSchema.safeParse(fields);
  const parsed = findInputSchema.safeParse(inputFromForm(form, project.timeZone));
  if (!place.success || !parsed.success) {
    const errors = {
      ...(parsed.success ? {} : fieldErrorsFrom(detailsOf(parsed.error), (field) => field.split(".")[0])),
      ...(place.success ? {} : fieldErrorsFrom(detailsOf(place.error), (field) => field)),
    };
    return data({ errors }, { status: 400 });
  }
  const where = place.data;
  try {
    const position = await positionFromFields(project, where);
    const logged = await logFind(project, user, { ...parsed.data, position }, clientAddress(request));
    return redirect(`/projects/${project.id}/finds/${logged.id}?logged=1`);
  } catch (error) {
    if (error instanceof DomainError) {
      return data({ errors: fieldErrorsFrom(positionErrorsOnFields(error.details, where), (field) => field) }, { status: 400 });
    }
    throw error;
  }
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Log a find · Firmsand" }];
}

const inputClass = "mt-1 block w-full rounded border border-line bg-panel px-3 py-2 focus:outline-2 focus:outline-offset-1 focus:outline-lagoon";

function HumanRemainsProtocol() {
  return (
    <section role="alert" aria-labelledby="remains-protocol" className="rounded border-2 border-danger bg-panel p-4" data-testid="human-remains-protocol">
      <h3 id="remains-protocol" className="font-semibold text-danger">Human remains: stop, secure, notify</h3>
      <ol className="mt-2 list-decimal space-y-1 pl-5 text-sm">
        {HUMAN_REMAINS_PROTOCOL.map((step) => <li key={step}>{step}</li>)}
      </ol>
      <p className="mt-2 text-sm text-muted">{HUMAN_REMAINS_DEFERENCE}</p>
    </section>
  );
}

export default function LogFind({ loaderData, actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  const [category, setCategory] = useState<FindCategory | "">("");
  const [idempotencyKey] = useState(() => (typeof crypto !== "undefined" && "randomUUID" in crypto ? crypto.randomUUID() : ""));
  return (
    <div className="max-w-xl space-y-4">
      <h2 className="text-lg font-semibold">Log a find</h2>
      <ActionMessages error={errors.form} />
      {category === "human-remains" ? <HumanRemainsProtocol /> : null}
      {category && HOLD_CATEGORIES.includes(category) ? (
        <p className="rounded border border-caution bg-panel px-3 py-2 text-sm text-caution">
          Saving places a stop-work hold on the cells around this find: they cannot be assigned until the hold is lifted with the name of whoever authorised resuming.
        </p>
      ) : null}
      <Form method="post" className="space-y-4">
        <input type="hidden" name="idempotencyKey" value={idempotencyKey} />
        <div>
          <label htmlFor="category" className="block text-sm font-medium">Category</label>
          <select id="category" name="category" required value={category} onChange={(event) => setCategory(event.target.value as FindCategory)} className={inputClass} aria-invalid={errors.category ? true : undefined}>
            <option value="">Choose…</option>
            {FIND_CATEGORIES.map((value) => <option key={value} value={value}>{FIND_CATEGORY_LABELS[value]}</option>)}
          </select>
          {errors.category ? <p className="mt-1 text-sm text-danger">{errors.category}</p> : null}
        </div>
        <div>
          <label htmlFor="description" className="block text-sm font-medium">Description</label>
          <textarea id="description" name="description" rows={3} required maxLength={4000} className={inputClass} aria-invalid={errors.description ? true : undefined} />
          {errors.description ? <p className="mt-1 text-sm text-danger">{errors.description}</p> : null}
        </div>
        <div className="grid grid-cols-2 gap-3">
          <TextField label="Material" name="material" maxLength={120} error={errors.material} />
          <TextField label="Count" name="count" type="number" inputMode="numeric" min={1} defaultValue={1} error={errors.count} />
        </div>
        {category === "faunal" ? (
          <div className="grid grid-cols-2 gap-3">
            <TextField label="Taxon" name="taxon" maxLength={120} placeholder="white-tailed deer" error={errors.taxon} />
            <TextField label="Element" name="element" maxLength={120} placeholder="antler" error={errors.element} />
          </div>
        ) : null}
        <TextField label="Condition" name="condition" maxLength={200} error={errors.condition} />
        <ProvenienceFields options={loaderData} errors={errors} tagLabel="Field tag no." />
        <TextField label="Found at (project time)" name="foundAt" type="datetime-local" required defaultValue={loaderData.now} hint={`Time zone ${loaderData.timeZone}.`} error={errors.foundAt} />
        <p className="text-sm text-muted">Photos come next, on the find's page. Cell and depths are confidential: only the resource monitor, the manager and site administrators see them.</p>
        <SubmitButton pendingLabel="Saving…" className="w-full sm:w-auto">Save find</SubmitButton>
      </Form>
    </div>
  );
}
