import { useState } from "react";
import { Form, Link, data } from "react-router";
import { amountText, basketTotals, FIND_CATEGORY_LABELS, handVolumeText, type FindCategory } from "../../shared/finds/finds";
import { handVolumeUnitsFor, measureLabel } from "../../shared/units";
import { ActionMessages } from "~/components/form-message";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { ProvenienceFields } from "~/components/finds/provenience-fields";
import { formFields, positionErrorsOnFields, positionFieldsSchema, prefillSchema, provenienceFromForm } from "~/components/finds/provenience";
import { requireRole } from "~/lib/auth/access.server";
import { DomainError, detailsOf } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { fieldErrorsFrom } from "~/lib/http/form";
import { readPageForm } from "~/lib/http/body.server";
import { BASKET_CATEGORIES } from "~/lib/field-records/inputs";
import { basketLoadInputSchema, findFormOptions, logBasketLoad, positionFromFields, type BasketLogged } from "~/models/finds.server";
import type { Route } from "./+types/projects.$projectId.finds.basket";

// Log a basket load: what one basket brought up on a dive, a line per kind with its count, its
// volume as measured (gallons, cubic feet, litres, cubic metres) or both, all with the same provenience. Each line becomes a catalogue entry; a cultural object or human remains is
// logged on its own (it places a stop-work hold and needs its own photos and custody).

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId, "finds.log");
  return findFormOptions(project, prefillSchema.parse(Object.fromEntries(new URL(request.url).searchParams)));
}

/** The most lines one form sends (the schema's limit). */
const MAX_LINES = 30;

/** Form fields → the API's input shape: lines are `lines.<n>.<field>`, read in order, blank lines left out. */
function inputFromForm(form: FormData, timeZone: string) {
  const { text, number } = formFields(form);
  const lines = [];
  for (let index = 0; index < MAX_LINES + 1; index++) {
    const field = (name: string) => `lines.${index}.${name}`;
    if (!form.has(field("category"))) continue;
    if (!text(field("description")) && !text(field("count")) && !text(field("volume")) && !text(field("material"))) continue;
    // A volume is its figure in the unit chosen beside it; the unit alone (always sent) is no volume.
    const volume = text(field("volume")) === undefined ? undefined : { value: number(field("volume")), unit: text(field("volumeUnit")) };
    lines.push({
      category: text(field("category")), description: text(field("description")), count: number(field("count")), volume,
      material: text(field("material")), taxon: text(field("taxon")), element: text(field("element")),
      /** The line's number on the form, for its errors. */
      formIndex: index,
    });
  }
  return { ...provenienceFromForm(form, timeZone), lines };
}

type ActionData = { errors: Record<string, string>; logged: null } | { errors: Record<string, string>; logged: BasketLogged["finds"] };

export async function action({ request, params }: Route.ActionArgs) {
  const { project, user } = await requireRole(request, params.projectId, "finds.log");
  const form = await readPageForm(request);
  const fields = Object.fromEntries([...form].filter((entry): entry is [string, string] => typeof entry[1] === "string"));
  const place = positionFieldsSchema.safeParse(fields);
  const raw = inputFromForm(form, project.timeZone);
  const parsed = basketLoadInputSchema.safeParse({ ...raw, lines: raw.lines.map(({ formIndex: _, ...line }) => line) });
  // A line's error is said on its own field: lines.<position on the form>.<field>.
  const onForm = (field: string) => {
    const [head, index, name] = field.split(".");
    if (head !== "lines") return head;
    if (index === undefined || name === undefined) return "lines";
    return `lines.${raw.lines[Number(index)]?.formIndex ?? index}.${name}`;
  };
  if (!place.success || !parsed.success) {
    const errors = {
      ...(parsed.success ? {} : fieldErrorsFrom(detailsOf(parsed.error), onForm)),
      ...(place.success ? {} : fieldErrorsFrom(detailsOf(place.error), (field) => field)),
    };
    return data<ActionData>({ errors, logged: null }, { status: 400 });
  }
  try {
    const position = await positionFromFields(project, place.data);
    const logged = await logBasketLoad(project, user, { ...parsed.data, position }, clientAddress(request));
    return { errors: {}, logged: logged.finds } satisfies ActionData;
  } catch (error) {
    if (error instanceof DomainError) return data<ActionData>({ errors: fieldErrorsFrom(positionErrorsOnFields(error.details, place.data), onForm), logged: null }, { status: 400 });
    throw error;
  }
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Log a basket load · Firmsand" }];
}

const inputClass = "mt-1 block w-full rounded border border-line bg-panel px-3 py-2 focus:outline-2 focus:outline-offset-1 focus:outline-lagoon";

export default function LogBasket({ loaderData, actionData }: Route.ComponentProps) {
  const errors: Record<string, string> = actionData?.errors ?? {};
  const logged = actionData?.logged ?? null;
  const { projectId } = loaderData;
  // Each line keeps its number on the form (its field names) when one above it is removed.
  const [lines, setLines] = useState<Array<{ id: number; category: FindCategory }>>([{ id: 0, category: "modern-debris" }]);
  const [idempotencyKey] = useState(() => (typeof crypto !== "undefined" && "randomUUID" in crypto ? crypto.randomUUID() : ""));
  const nextId = () => Math.max(-1, ...lines.map((line) => line.id)) + 1;
  const volumeUnits = handVolumeUnitsFor(loaderData.lengthUnit);

  if (logged) {
    const totals = basketTotals(logged, loaderData.lengthUnit);
    return (
      <div className="max-w-xl space-y-4" data-testid="basket-logged">
        <h2 className="text-lg font-semibold">Basket load logged</h2>
        <p className="text-sm" data-testid="basket-totals">
          {totals.items > 0 ? <><span className="figures">{totals.items}</span> item{totals.items === 1 ? "" : "s"} counted</> : null}
          {totals.items > 0 && totals.volume ? " and " : null}
          {totals.volume ? <><span className="figures">{handVolumeText(totals.volume)}</span> by volume</> : null}
          {" "}in <span className="figures">{logged.length}</span> catalogue entr{logged.length === 1 ? "y" : "ies"}:
        </p>
        <ul className="space-y-1 text-sm">
          {logged.map((find) => (
            <li key={find.id}>
              <Link to={`/projects/${projectId}/finds/${find.id}`} className="figures underline">{find.catalogueNumber}</Link> · {FIND_CATEGORY_LABELS[find.category]} · <span className="figures">{amountText(find)}</span>
            </li>
          ))}
        </ul>
        <p className="flex flex-wrap gap-4 text-sm">
          <a href={`/projects/${projectId}/finds/basket`} className="text-lagoon underline">Log another basket</a>
          <Link to={`/projects/${projectId}/finds`} className="text-lagoon underline">Finds catalogue</Link>
        </p>
      </div>
    );
  }

  return (
    <div className="max-w-xl space-y-4">
      <h2 className="text-lg font-semibold">Log a basket load</h2>
      <p className="text-sm text-muted">
        What one basket brought up: a line per kind, with how many, the volume it filled, or both (loose debris is easier to measure in a bucket than to count).
        Every line is catalogued with the same dive, cell and time. A cultural object or human
        remains is not counted here: <Link to={`/projects/${projectId}/finds/new`} className="text-lagoon underline">log it on its own</Link>; it stops work around it.
      </p>
      <ActionMessages error={errors.form ?? errors.lines} />
      <Form method="post" className="space-y-4">
        <input type="hidden" name="idempotencyKey" value={idempotencyKey} />
        <fieldset className="space-y-3">
          <legend className="text-sm font-medium">In the basket</legend>
          {lines.map((line, position) => {
            const name = (field: string) => `lines.${line.id}.${field}`;
            const error = (field: string) => errors[name(field)];
            return (
              <div key={line.id} className="space-y-2 rounded border border-line p-3" data-testid="basket-line">
                <div className="flex items-end gap-2">
                  <div className="flex-1">
                    <label htmlFor={name("category")} className="block text-sm font-medium">Line {position + 1}: category</label>
                    <select
                      id={name("category")} name={name("category")} value={line.category} className={inputClass}
                      onChange={(event) => setLines((current) => current.map((candidate) => (candidate.id === line.id ? { ...candidate, category: event.target.value as FindCategory } : candidate)))}
                      aria-invalid={error("category") ? true : undefined}
                    >
                      {BASKET_CATEGORIES.map((value) => <option key={value} value={value}>{FIND_CATEGORY_LABELS[value]}</option>)}
                    </select>
                  </div>
                  {lines.length > 1 ? (
                    <button type="button" className="rounded border border-line px-3 py-2 text-sm" onClick={() => setLines((current) => current.filter((candidate) => candidate.id !== line.id))} aria-label={`Remove line ${position + 1}`}>
                      Remove
                    </button>
                  ) : null}
                </div>
                {error("category") ? <p className="text-sm text-danger">{error("category")}</p> : null}
                <TextField label="What it is" name={name("description")} required maxLength={4000} placeholder="glass bottles" error={error("description")} />
                <fieldset>
                  <legend className="sr-only">Line {position + 1}: how many or how much</legend>
                  <div className="grid grid-cols-[minmax(0,1fr)_minmax(0,1fr)_6.5rem] items-start gap-3">
                    <TextField label="Count" name={name("count")} type="number" inputMode="numeric" min={1} step={1} aria-invalid={error("count") ? true : undefined} aria-describedby={error("count") ? `${name("count")}-error` : `${name("amount")}-hint`} />
                    <TextField label="Volume" name={name("volume")} type="number" inputMode="decimal" min={0} step="any" aria-invalid={error("volume") ? true : undefined} aria-describedby={error("volume") ? `${name("volume")}-error` : `${name("amount")}-hint`} />
                    <div>
                      <label htmlFor={name("volumeUnit")} className="block text-sm font-medium">Unit</label>
                      <select id={name("volumeUnit")} name={name("volumeUnit")} className={inputClass} defaultValue={volumeUnits[0]}>
                        {volumeUnits.map((unit) => <option key={unit} value={unit}>{measureLabel(unit)}</option>)}
                      </select>
                    </div>
                  </div>
                  {/* Said below the row, full width: a narrow column would wrap a long refusal into many lines. */}
                  {error("count") ? <p id={`${name("count")}-error`} className="mt-1 text-sm text-danger">{error("count")}</p> : null}
                  {error("volume") ? <p id={`${name("volume")}-error`} className="mt-1 text-sm text-danger">{error("volume")}</p> : null}
                  <p id={`${name("amount")}-hint`} className="mt-1 text-sm text-muted">The count, the volume, or both.</p>
                </fieldset>
                <TextField label="Material" name={name("material")} maxLength={120} error={error("material")} />
                {line.category === "faunal" ? (
                  <div className="grid grid-cols-2 gap-3">
                    <TextField label="Taxon" name={name("taxon")} maxLength={120} placeholder="turtle" error={error("taxon")} />
                    <TextField label="Element" name={name("element")} maxLength={120} placeholder="carapace fragments" error={error("element")} />
                  </div>
                ) : null}
              </div>
            );
          })}
          {lines.length < MAX_LINES ? (
            <button type="button" className="rounded border border-line px-3 py-2 text-sm" onClick={() => setLines((current) => [...current, { id: nextId(), category: current.at(-1)?.category ?? "modern-debris" }])}>
              Add a line
            </button>
          ) : null}
        </fieldset>
        <ProvenienceFields options={loaderData} errors={errors} tagLabel="Basket tag no." />
        <TextField label="Condition" name="condition" maxLength={200} error={errors.condition} />
        <TextField label="Brought up at (project time)" name="foundAt" type="datetime-local" required defaultValue={loaderData.now} hint={`Time zone ${loaderData.timeZone}.`} error={errors.foundAt} />
        <p className="text-sm text-muted">Cell and depths are confidential: only the resource monitor, the manager and site administrators see them.</p>
        <SubmitButton pendingLabel="Saving…" className="w-full sm:w-auto">Save basket load</SubmitButton>
      </Form>
    </div>
  );
}
