import { Form, data } from "react-router";
import { can } from "~/lib/auth/permissions";
import { requireRole } from "~/lib/auth/access.server";
import { DomainError, detailsOf } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { fieldErrorsFrom, type FieldErrors } from "~/lib/http/form";
import { ActionMessages } from "~/components/form-message";
import { SubmitButton } from "~/components/submit-button";
import { DewateringCaution, DewateringNav, FieldInput, FieldSelect, formatFigure } from "~/components/dewatering/dewatering-section";
import { DEWATERING_CAUTION, dewateringSettings, projectToday } from "~/models/dewatering.server";
import { addHaulSite, haulInputSchema, haulSiteInputSchema, listHauls, listHaulSites, recordHaul } from "~/models/hauls.server";
import { massUnitsFor, measureLabel, unitLabel } from "../../shared/units";
import type { Route } from "./+types/projects.$projectId.dewatering.hauls";
import { readPageForm } from "~/lib/http/body.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId);
  const { project } = access;
  const [hauls, sites, settings, today] = await Promise.all([listHauls(project), listHaulSites(project), dewateringSettings(project), projectToday(project)]);
  const units = massUnitsFor(project.lengthUnit);
  return {
    project: { id: project.id },
    hauls, sites, settings,
    loadUnits: [
      { value: units.bulkMass, label: `wet ${measureLabel(units.bulkMass)} (scale ticket)` },
      { value: project.lengthUnit === "m" ? "m3" : "yd3", label: `${unitLabel(project.lengthUnit, "volume")} (truck body)` },
    ],
    today,
    canLog: can(access, "dewatering.log"),
    caution: DEWATERING_CAUTION,
  };
}

type ActionResult = { intent: "haul" | "site"; errors: FieldErrors; notice: string | null };
const text = (value: FormDataEntryValue | null) => (typeof value === "string" ? value.trim() : "");

export async function action({ request, params }: Route.ActionArgs) {
  const { user, project } = await requireRole(request, params.projectId, "dewatering.log");
  const form = await readPageForm(request);
  const intent = text(form.get("intent")) === "site" ? "site" : text(form.get("intent")) === "haul" ? "haul" : null;
  if (intent === null) return data({ intent: "haul", errors: { form: "Unknown request." } as FieldErrors, notice: null } satisfies ActionResult, { status: 400 });
  const refused = (errors: FieldErrors) => data({ intent, errors, notice: null } satisfies ActionResult, { status: 400 });
  try {
    if (intent === "site") {
      const parsed = haulSiteInputSchema.safeParse({ name: text(form.get("name")), kind: text(form.get("kind")), permitNumber: text(form.get("permitNumber")) });
      if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), (field) => field));
      const site = await addHaulSite(project, user, parsed.data, clientAddress(request));
      return { intent, errors: {} as FieldErrors, notice: `Added ${site.name} to the sites.` } satisfies ActionResult;
    }
    const cake = text(form.get("cakeSolidsPercent"));
    const parsed = haulInputSchema.safeParse({
      date: text(form.get("date")), ticketNumber: text(form.get("ticketNumber")), truck: text(form.get("truck")), site: Number(text(form.get("site"))) || text(form.get("site")),
      load: { value: text(form.get("loadValue")) === "" ? Number.NaN : Number(text(form.get("loadValue"))), unit: text(form.get("loadUnit")) },
      cakeSolidsByWeight: cake === "" ? null : Number(cake) / 100, notes: text(form.get("notes")),
    });
    const inputOf = (field: string) => (field.startsWith("load") ? "loadValue" : field === "cakeSolidsByWeight" ? "cakeSolidsPercent" : field);
    if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), inputOf));
    const { haul } = await recordHaul(project, user, parsed.data, clientAddress(request));
    return { intent, errors: {} as FieldErrors, notice: `Recorded ticket ${haul.ticketNumber}: ${formatFigure(haul.drySolids.value, 2)} ${haul.drySolids.label}.` } satisfies ActionResult;
  } catch (error) {
    if (error instanceof DomainError) return refused(fieldErrorsFrom(error.details, (field) => (field === "cakeSolidsByWeight" ? "cakeSolidsPercent" : field)));
    throw error;
  }
}

export default function DewateringHauls({ loaderData, actionData }: Route.ComponentProps) {
  const { hauls, sites, settings, project } = loaderData;
  const errorsFor = (intent: ActionResult["intent"]) => (actionData?.intent === intent ? actionData.errors : ({} as FieldErrors));
  return (
    <div className="space-y-5">
      <DewateringNav projectId={project.id} />
      <DewateringCaution text={loaderData.caution} />
      <ActionMessages error={actionData?.errors.form} notice={actionData?.notice} />
      {loaderData.canLog ? (
        <section aria-labelledby="enter-haul" className="rounded border border-line bg-panel p-4">
          <h2 id="enter-haul" className="font-semibold">Enter a haul ticket</h2>
          <p className="mt-1 text-xs text-muted">Ticket photos come with the project's file storage, later. Dry solids = wet load × cake solids; a truck-body volume is weighed through a saturated cake of the project's solids specific gravity ({settings.solidsSpecificGravity}).</p>
          {sites.length === 0 ? <p className="mt-2 text-sm text-caution">Add a destination site below first.</p> : (
            <Form method="post" className="mt-3 grid gap-3 sm:grid-cols-2">
              <FieldInput label="Date" name="date" type="date" required defaultValue={loaderData.today} error={errorsFor("haul").date} />
              <FieldInput label="Ticket number" name="ticketNumber" required error={errorsFor("haul").ticketNumber} />
              <FieldInput label="Truck" name="truck" required error={errorsFor("haul").truck} />
              <FieldSelect label="Destination" name="site" required error={errorsFor("haul").site}>
                {sites.map((site) => <option key={site.id} value={site.id}>{site.name} ({site.kind}, {site.permitNumber})</option>)}
              </FieldSelect>
              <FieldInput label="Load" name="loadValue" inputMode="decimal" required error={errorsFor("haul").loadValue} />
              <FieldSelect label="Load unit" name="loadUnit">
                {loaderData.loadUnits.map((unit) => <option key={unit.value} value={unit.value}>{unit.label}</option>)}
              </FieldSelect>
              <FieldInput label="Cake solids (%)" name="cakeSolidsPercent" inputMode="decimal" error={errorsFor("haul").cakeSolidsPercent}
                hint={settings.cakeSolidsByWeight === null ? "from the load's sample (the project has no default)" : `blank: the project default, ${formatFigure(settings.cakeSolidsByWeight * 100, 1)} %`} />
              <FieldInput label="Notes" name="notes" error={errorsFor("haul").notes} />
              <div className="sm:col-span-2"><SubmitButton pendingLabel="Recording…" intent="haul" className="w-full py-3 sm:w-auto">Record the ticket</SubmitButton></div>
            </Form>
          )}
        </section>
      ) : null}
      <section aria-labelledby="haul-list" className="space-y-2">
        <h2 id="haul-list" className="font-semibold">Haul tickets</h2>
        {hauls.length === 0 ? <p className="text-sm text-muted">No tickets yet.</p> : (
          <div className="overflow-x-auto">
            <table className="w-full border-collapse text-sm">
              <thead><tr className="border-b border-line text-left"><th className="py-1 pr-2">Date</th><th className="pr-2">Ticket</th><th className="pr-2">Truck</th><th className="pr-2">Destination</th><th className="pr-2">Load</th><th className="pr-2">Cake solids</th><th>Dry solids</th></tr></thead>
              <tbody>
                {hauls.map((haul) => (
                  <tr key={haul.id} className="border-b border-line">
                    <td className="py-1 pr-2 whitespace-nowrap">{haul.date}</td><td className="pr-2">{haul.ticketNumber}</td><td className="pr-2 whitespace-nowrap">{haul.truck}</td>
                    <td className="pr-2 whitespace-nowrap">{haul.site.name}</td>
                    <td className="pr-2 whitespace-nowrap">{formatFigure(haul.load.value, 1)} {haul.load.label}</td>
                    <td className="pr-2 whitespace-nowrap">{formatFigure(haul.cakeSolidsByWeight * 100, 1)} % <span className="text-xs text-muted">({haul.cakeSolidsFrom})</span></td>
                    <td className="whitespace-nowrap">{formatFigure(haul.drySolids.value, 2)} {haul.drySolids.label}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </section>
      <section aria-labelledby="haul-sites" className="space-y-2">
        <h2 id="haul-sites" className="font-semibold">Reuse and disposal sites</h2>
        {sites.length === 0 ? <p className="text-sm text-muted">No sites yet.</p> : (
          <ul className="text-sm">{sites.map((site) => <li key={site.id}>{site.name} · {site.kind} · permit or agreement {site.permitNumber}</li>)}</ul>
        )}
        {loaderData.canLog ? (
          <Form method="post" className="grid gap-3 rounded border border-line bg-panel p-4 sm:grid-cols-4 sm:items-end">
            <FieldInput label="Site name" name="name" required error={errorsFor("site").name} />
            <FieldSelect label="Kind" name="kind" error={errorsFor("site").kind}><option value="reuse">reuse</option><option value="disposal">disposal</option></FieldSelect>
            <FieldInput label="Permit or agreement number" name="permitNumber" required error={errorsFor("site").permitNumber} />
            <SubmitButton pendingLabel="Adding…" intent="site" tone="plain">Add the site</SubmitButton>
          </Form>
        ) : null}
      </section>
    </div>
  );
}

export function meta() {
  return [{ title: "Haul tickets · Firmsand" }];
}
