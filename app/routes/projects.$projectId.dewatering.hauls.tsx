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
import { addHaulPhoto, addHaulSite, haulInputSchema, haulSiteInputSchema, listHauls, listHaulSites, recordHaul } from "~/models/hauls.server";
import { NotFoundError } from "~/lib/errors";
import { urlIdSchema } from "~/lib/http/url-id";
import { PHOTO_MAX_BYTES } from "~/lib/images/photo.server";
import { stagePhotoUpload } from "~/lib/images/stored-photo.server";
import { discardStagedFile, UploadRefused, type StagedUpload } from "~/lib/import/stage-upload.server";
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
    photoMaxMegabytes: PHOTO_MAX_BYTES / 1024 / 1024,
  };
}

type ActionResult = { intent: "haul" | "site" | "photo"; errors: FieldErrors; notice: string | null; haulId?: number };

export async function action({ request, params }: Route.ActionArgs) {
  const { user, project } = await requireRole(request, params.projectId, "dewatering.log");
  const ip = clientAddress(request);
  // The ticket form and a ticket's photo form carry a photo, so they are multipart; the site form is read within the page-form limit.
  let staged: StagedUpload;
  if ((request.headers.get("Content-Type") ?? "").toLowerCase().startsWith("multipart/form-data")) {
    try {
      staged = await stagePhotoUpload(request);
    } catch (error) {
      if (error instanceof UploadRefused) return data({ intent: "photo", errors: { form: error.message } as FieldErrors, notice: null } satisfies ActionResult, { status: 400 });
      throw error;
    }
  } else {
    staged = { fields: Object.fromEntries([...(await readPageForm(request)).entries()].filter((entry): entry is [string, string] => typeof entry[1] === "string")), file: null };
  }
  const text = (name: string) => (staged.fields[name] ?? "").trim();
  const intent = (["site", "haul", "photo"] as const).find((candidate) => candidate === text("intent")) ?? null;
  try {
    if (intent === null) return data({ intent: "haul", errors: { form: "Unknown request." } as FieldErrors, notice: null } satisfies ActionResult, { status: 400 });
    const refused = (errors: FieldErrors, haulId?: number) => data({ intent, errors, notice: null, haulId } satisfies ActionResult, { status: 400 });
    const emptyFile = staged.emptyFileName ? `"${staged.emptyFileName}" is an empty file; choose the photo again.` : null;
    try {
      if (intent === "site") {
        const parsed = haulSiteInputSchema.safeParse({ name: text("name"), kind: text("kind"), permitNumber: text("permitNumber") });
        if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), (field) => field));
        const site = await addHaulSite(project, user, parsed.data, ip);
        return { intent, errors: {} as FieldErrors, notice: `Added ${site.name} to the sites.` } satisfies ActionResult;
      }
      if (intent === "photo") {
        const haulId = urlIdSchema.safeParse(text("haulId"));
        if (!haulId.success) return refused({ form: "Choose a ticket." });
        if (!staged.file) return refused({ file: emptyFile ?? "Choose a photo of the ticket." }, haulId.data);
        await addHaulPhoto(project, user, haulId.data, staged.file, ip);
        return { intent, errors: {} as FieldErrors, notice: "Added the ticket's photo.", haulId: haulId.data } satisfies ActionResult;
      }
      if (emptyFile) return refused({ file: emptyFile });
      const cake = text("cakeSolidsPercent");
      const parsed = haulInputSchema.safeParse({
        date: text("date"), ticketNumber: text("ticketNumber"), truck: text("truck"), site: Number(text("site")) || text("site"),
        load: { value: text("loadValue") === "" ? Number.NaN : Number(text("loadValue")), unit: text("loadUnit") },
        cakeSolidsByWeight: cake === "" ? null : Number(cake) / 100, notes: text("notes"),
      });
      const inputOf = (field: string) => (field.startsWith("load") ? "loadValue" : field === "cakeSolidsByWeight" ? "cakeSolidsPercent" : field);
      if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), inputOf));
      const { haul } = await recordHaul(project, user, parsed.data, ip, staged.file);
      return { intent, errors: {} as FieldErrors, notice: `Recorded ticket ${haul.ticketNumber}: ${formatFigure(haul.drySolids.value, 2)} ${haul.drySolids.label}${haul.photos.length > 0 ? ", with its photo" : ""}.` } satisfies ActionResult;
    } catch (error) {
      if (error instanceof NotFoundError && intent === "photo") throw new Response(error.message, { status: 404 });
      if (error instanceof DomainError) return refused(fieldErrorsFrom(error.details, (field) => (field === "cakeSolidsByWeight" ? "cakeSolidsPercent" : field)));
      throw error;
    }
  } finally {
    if (staged.file) await discardStagedFile(staged.file.path);
  }
}

export default function DewateringHauls({ loaderData, actionData }: Route.ComponentProps) {
  const { hauls, sites, settings, project } = loaderData;
  const result = actionData as ActionResult | undefined;
  const errorsFor = (intent: ActionResult["intent"]) => (result?.intent === intent ? result.errors : ({} as FieldErrors));
  const photoUrl = (haulId: number, photoId: number, thumb = false) => `/api/projects/${project.id}/hauls/${haulId}/photos/${photoId}${thumb ? "?size=thumb" : ""}`;
  return (
    <div className="space-y-5">
      <DewateringNav projectId={project.id} />
      <DewateringCaution text={loaderData.caution} />
      <ActionMessages error={result?.errors.form} notice={result?.notice} />
      {loaderData.canLog ? (
        <section aria-labelledby="enter-haul" className="rounded border border-line bg-panel p-4">
          <h2 id="enter-haul" className="font-semibold">Enter a haul ticket</h2>
          <p className="mt-1 text-xs text-muted">Dry solids = wet load × cake solids; a truck-body volume is weighed through a saturated cake of the project's solids specific gravity ({settings.solidsSpecificGravity}).</p>
          {sites.length === 0 ? <p className="mt-2 text-sm text-caution">Add a destination site below first.</p> : (
            <Form method="post" encType="multipart/form-data" className="mt-3 grid gap-3 sm:grid-cols-2">
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
              <div className="sm:col-span-2">
                <label htmlFor="ticket-photo" className="block text-sm font-medium">Photo of the ticket</label>
                <input id="ticket-photo" name="file" type="file" accept="image/jpeg,image/png,image/webp" aria-describedby="ticket-photo-hint" aria-invalid={errorsFor("haul").file ? true : undefined} className="mt-1 block w-full text-base" />
                <p id="ticket-photo-hint" className="mt-1 text-xs text-muted">The whole ticket, its number readable. JPEG, PNG or WebP, at most {loaderData.photoMaxMegabytes} MB; kept without its camera data.</p>
                {errorsFor("haul").file ? <p className="mt-1 text-sm text-danger">{errorsFor("haul").file}</p> : null}
              </div>
              <div className="sm:col-span-2"><SubmitButton pendingLabel="Recording…" intent="haul" className="w-full py-3 sm:w-auto">Record the ticket</SubmitButton></div>
            </Form>
          )}
        </section>
      ) : null}
      <section aria-labelledby="haul-list" className="space-y-2">
        <h2 id="haul-list" className="font-semibold">Haul tickets</h2>
        {hauls.length === 0 ? <p className="text-sm text-muted">No tickets yet.</p> : (
          <div className="overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label="Haul tickets, scrollable">
            <table className="w-full border-collapse text-sm">
              <thead><tr className="border-b border-line text-left"><th className="py-1 pr-2">Date</th><th className="pr-2 text-right">Ticket</th><th className="pr-2">Truck</th><th className="pr-2">Destination</th><th className="pr-2 text-right">Load</th><th className="pr-2 text-right">Cake solids</th><th className="pr-2 text-right">Dry solids</th><th>Ticket photo</th></tr></thead>
              <tbody>
                {hauls.map((haul) => (
                  <tr key={haul.id} className="border-b border-line">
                    <td className="figures py-1 pr-2 whitespace-nowrap">{haul.date}</td><td className="text-right figures pr-2">{haul.ticketNumber}</td><td className="pr-2 whitespace-nowrap">{haul.truck}</td>
                    <td className="pr-2 whitespace-nowrap">{haul.site.name}</td>
                    <td className="text-right figures pr-2 whitespace-nowrap">{formatFigure(haul.load.value, 1)} {haul.load.label}</td>
                    <td className="text-right pr-2 whitespace-nowrap"><span className="figures">{formatFigure(haul.cakeSolidsByWeight * 100, 1)} %</span> <span className="text-xs text-muted">({haul.cakeSolidsFrom})</span></td>
                    <td className="text-right figures pr-2 whitespace-nowrap">{formatFigure(haul.drySolids.value, 2)} {haul.drySolids.label}</td>
                    <td className="py-1" data-testid={`ticket-photos-${haul.ticketNumber}`}>
                      {haul.photos.length > 0 ? (
                        <ul className="flex gap-1">
                          {haul.photos.map((photo) => (
                            <li key={photo.id}><a href={photoUrl(haul.id, photo.id)}><img src={photoUrl(haul.id, photo.id, true)} alt={`Ticket ${haul.ticketNumber}: ${photo.originalFileName}`} className="h-12 w-16 rounded border border-line object-cover" loading="lazy" /></a></li>
                          ))}
                        </ul>
                      ) : <span className="text-muted">–</span>}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
        {loaderData.canLog && hauls.length > 0 ? (
          <Form method="post" encType="multipart/form-data" className="grid gap-3 rounded border border-line bg-panel p-4 sm:grid-cols-3 sm:items-end" aria-label="Add a photo to a ticket">
            <FieldSelect label="Ticket" name="haulId" required defaultValue={result?.intent === "photo" ? result.haulId : undefined}>
              {hauls.map((haul) => <option key={haul.id} value={haul.id}>{haul.ticketNumber} · {haul.date}{haul.photos.length > 0 ? ` (${haul.photos.length} photo${haul.photos.length === 1 ? "" : "s"})` : ""}</option>)}
            </FieldSelect>
            <div>
              <label htmlFor="later-ticket-photo" className="block text-sm font-medium">Photo of the ticket</label>
              <input id="later-ticket-photo" name="file" type="file" accept="image/jpeg,image/png,image/webp" required aria-invalid={errorsFor("photo").file ? true : undefined} aria-describedby={errorsFor("photo").file ? "later-ticket-photo-error" : undefined} className="mt-1 block w-full text-base" />
              {errorsFor("photo").file ? <p id="later-ticket-photo-error" className="mt-1 text-sm text-danger">{errorsFor("photo").file}</p> : null}
            </div>
            <SubmitButton pendingLabel="Uploading…" intent="photo" tone="plain">Add the photo</SubmitButton>
          </Form>
        ) : null}
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
