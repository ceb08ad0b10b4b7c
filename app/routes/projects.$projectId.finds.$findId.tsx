import { Form, Link, data, redirect } from "react-router";
import { z } from "zod";
import {
  CUSTODY_PURPOSES, CUSTODY_PURPOSE_LABELS, FIND_CATEGORY_LABELS, handVolumeText, FIND_STATUSES, FIND_STATUS_LABELS, instantToLocalDateTime, localDateTimeToInstant,
} from "../../shared/finds/finds";
import { unitLabel } from "../../shared/units";
import { ActionMessages } from "~/components/form-message";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { requireRole } from "~/lib/auth/access.server";
import { can } from "~/lib/auth/permissions";
import { DomainError, NotFoundError, detailsOf } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { fieldErrorsFrom } from "~/lib/http/form";
import { urlIdSchema } from "~/lib/http/url-id";
import { PHOTO_MAX_BYTES } from "~/lib/images/photo.server";
import { discardStagedFile, UploadRefused } from "~/lib/import/stage-upload.server";
import { stagePhotoUpload } from "~/lib/images/stored-photo.server";
import { addCustodyFormPhoto, addFindPhoto, custodyInputSchema, getFind, recordCustody, setFindStatus, statusInputSchema } from "~/models/finds.server";
import type { Route } from "./+types/projects.$projectId.finds.$findId";
import { readPageForm } from "~/lib/http/body.server";

// One find: what it is, who holds it and where (always at the top), its photos, the custody
// chain and status; cell, depths and the photos' camera data only for roles that may see locations.
// The monitor and the manager add photos, handovers (each with a photo of its signed paper form)
// and status changes here.

function findIdOf(value: string | undefined): number {
  const parsed = urlIdSchema.safeParse(value);
  if (!parsed.success) throw new Response("There is no such find in this project.", { status: 404 });
  return parsed.data;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId, "finds.read");
  const { project } = access;
  let find;
  try {
    find = await getFind(project, access, findIdOf(params.findId));
  } catch (error) {
    if (error instanceof NotFoundError) throw new Response(error.message, { status: 404 });
    throw error;
  }
  const local = (iso: string) => instantToLocalDateTime(new Date(iso), project.timeZone);
  const logged = new URL(request.url).searchParams.get("logged") === "1";
  return {
    projectId: project.id, lengthLabel: unitLabel(project.lengthUnit), timeZone: project.timeZone,
    photoMaxMegabytes: PHOTO_MAX_BYTES / 1024 / 1024,
    canLog: can(access, "finds.log"), seesLocations: can(access, "finds.locations.read"),
    notice: logged ? `Find ${find.catalogueNumber} logged.${find.hold && !find.hold.lifted ? ` A stop-work hold (#${find.hold.id}) now covers ${find.hold.cells.length} cells.` : ""} Add its photos below.` : null,
    find: { ...find, foundAtLocal: local(find.foundAt), custody: find.custody.map((entry) => ({ ...entry, handedAtLocal: local(entry.handedAt) })) },
    now: local(new Date().toISOString()).replace(" ", "T"),
  };
}

const formSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("custody"), fromName: z.string(), toName: z.string(), place: z.string(), purpose: z.string(), handedAt: z.string(), receiverSignature: z.string(), note: z.string().optional() }),
  z.object({ intent: z.literal("status"), status: z.string(), accessionNumber: z.string().optional(), note: z.string().optional() }),
]);

/**
 * The photo of a handover's signed paper form, from its own form on the handover (the handover
 * named in the address, `?custody=<id>`, so a refusal before the body is read still lands on its
 * form). Kept through the one photo path; a refused photo stores nothing.
 */
async function attachFormPhoto(request: Request, project: Parameters<typeof addCustodyFormPhoto>[0], user: Parameters<typeof addCustodyFormPhoto>[1], findId: number, custodyParam: string, ip: string | null) {
  const custodyId = urlIdSchema.safeParse(custodyParam);
  const refused = (message: string) => data({ intent: "form-photo", custodyId: custodyId.success ? custodyId.data : null, errors: { formPhoto: message }, notice: null }, { status: 400 });
  if (!custodyId.success) return refused("Choose the handover the signed form belongs to.");
  let staged;
  try {
    staged = await stagePhotoUpload(request);
  } catch (error) {
    if (error instanceof UploadRefused) return data({ intent: "form-photo", custodyId: custodyId.data, errors: { formPhoto: error.message }, notice: null }, { status: error.status });
    throw error;
  }
  try {
    if (!staged.file) return refused(staged.emptyFileName ? `"${staged.emptyFileName}" is an empty file; take or choose the photo again.` : "Take or choose the photo of the signed form.");
    await addCustodyFormPhoto(project, user, findId, custodyId.data, staged.file, ip);
    return { intent: "form-photo", custodyId: custodyId.data, errors: {}, notice: "Photo of the signed form attached to the handover." };
  } catch (error) {
    if (error instanceof NotFoundError) return refused(error.message);
    if (error instanceof DomainError) return data({ intent: "form-photo", custodyId: custodyId.data, errors: { formPhoto: error.details.map((detail) => detail.message).join(" ") }, notice: null }, { status: 400 });
    throw error;
  } finally {
    if (staged.file) await discardStagedFile(staged.file.path);
  }
}

export async function action({ request, params }: Route.ActionArgs) {
  const { project, user } = await requireRole(request, params.projectId, "finds.log");
  const findId = findIdOf(params.findId);
  const ip = clientAddress(request);
  const refused = (errors: Record<string, string>, intent: string) => data({ intent, errors, notice: null }, { status: 400 });
  const custodyParam = new URL(request.url).searchParams.get("custody");
  if (custodyParam !== null) return attachFormPhoto(request, project, user, findId, custodyParam, ip);
  try {
    if ((request.headers.get("Content-Type") ?? "").startsWith("multipart/form-data")) {
      let staged;
      try {
        staged = await stagePhotoUpload(request);
      } catch (error) {
        if (error instanceof UploadRefused) return refused({ file: error.message }, "photo");
        throw error;
      }
      try {
        if (!staged.file) return refused({ file: "Choose a photo to add." }, "photo");
        await addFindPhoto(project, user, findId, staged.file, ip);
      } finally {
        if (staged.file) await discardStagedFile(staged.file.path);
      }
      return redirect(`/projects/${project.id}/finds/${findId}`);
    }
    const form = formSchema.safeParse(Object.fromEntries(await readPageForm(request)));
    if (!form.success) return refused({ form: "That request is not one this page makes." }, "invalid");
    if (form.data.intent === "custody") {
      const { intent: _intent, ...fields } = form.data;
      const handedAt = localDateTimeToInstant(fields.handedAt, project.timeZone)?.toISOString() ?? fields.handedAt;
      const parsed = custodyInputSchema.safeParse({ ...fields, handedAt, note: fields.note || undefined });
      if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), (field) => field), "custody");
      await recordCustody(project, user, findId, parsed.data, ip);
      return { intent: "custody", errors: {}, notice: `Handover to ${parsed.data.toName} recorded.` };
    }
    const parsed = statusInputSchema.safeParse({ status: form.data.status, accessionNumber: form.data.accessionNumber || undefined, note: form.data.note || undefined });
    if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), (field) => field), "status");
    await setFindStatus(project, user, findId, parsed.data, ip);
    return { intent: "status", errors: {}, notice: `Status set to ${FIND_STATUS_LABELS[parsed.data.status]}.` };
  } catch (error) {
    if (error instanceof NotFoundError) throw new Response(error.message, { status: 404 });
    if (error instanceof DomainError) return refused(fieldErrorsFrom(error.details, (field) => field), "service");
    throw error;
  }
}

export function meta({ data: loaded }: Route.MetaArgs) {
  return [{ title: `${loaded?.find.catalogueNumber ?? "Find"} · Firmsand` }];
}

const inputClass = "mt-1 block w-full rounded border border-line bg-panel px-3 py-2 focus:outline-2 focus:outline-offset-1 focus:outline-lagoon";

function Fact({ label, children }: { label: string; children: React.ReactNode }) {
  return (
    <>
      <dt className="text-muted">{label}</dt>
      <dd>{children}</dd>
    </>
  );
}

export default function FindPage({ loaderData, actionData }: Route.ComponentProps) {
  const { find, projectId, seesLocations, lengthLabel } = loaderData;
  const errors: Record<string, string> = actionData?.errors ?? {};
  // The handover whose signed-form photo was just sent (its error is said on its own form).
  const formPhotoFor = actionData && "custodyId" in actionData ? actionData.custodyId : null;
  const photoUrl = (photoId: number, thumb = false) => `/api/projects/${projectId}/finds/${find.id}/photos/${photoId}${thumb ? "?size=thumb" : ""}`;
  return (
    <div className="space-y-8">
      <ActionMessages error={errors.form ?? errors.file} notice={actionData?.notice ?? loaderData.notice} />
      <section aria-labelledby="find-heading" className="space-y-3">
        <p className="text-sm"><Link className="underline" to={`/projects/${projectId}/finds`}>Finds catalogue</Link></p>
        <h2 id="find-heading" className="text-xl font-semibold"><span className="figures">{find.catalogueNumber}</span> · {FIND_CATEGORY_LABELS[find.category]}</h2>
        <p className="rounded border border-lagoon bg-panel px-3 py-2" data-testid="current-holder">
          <span className="font-medium">Held by {find.currentHolder.name}</span>, {find.currentHolder.place} · status: {FIND_STATUS_LABELS[find.status]}
        </p>
        <dl className="grid grid-cols-[max-content_1fr] gap-x-6 gap-y-1 text-sm">
          <Fact label="Description">{find.description}</Fact>
          {find.material ? <Fact label="Material">{find.material}</Fact> : null}
          {find.count !== null ? <Fact label="Count"><span className="figures">{find.count}</span></Fact> : null}
          {find.volume ? <Fact label="Volume"><span className="figures" data-testid="find-volume">{handVolumeText(find.volume)}</span></Fact> : null}
          {find.fromBasket ? <Fact label="Logged as">a line of a basket load (debris removed by hand)</Fact> : null}
          {find.taxon || find.element ? <Fact label="Taxon, element">{[find.taxon, find.element].filter(Boolean).join(", ")}</Fact> : null}
          {find.condition ? <Fact label="Condition">{find.condition}</Fact> : null}
          <Fact label="Found"><span className="figures">{find.foundAtLocal}</span> ({loaderData.timeZone}){find.finder ? ` by ${find.finder}` : ""}</Fact>
          {find.fieldTag ? <Fact label="Field tag"><span className="figures">{find.fieldTag}</span></Fact> : null}
          {find.accessionNumber ? <Fact label="Lab accession no."><span className="figures">{find.accessionNumber}</span></Fact> : null}
          {find.statusNote ? <Fact label="Status note">{find.statusNote}</Fact> : null}
          {seesLocations ? (
            <>
              <Fact label="Cell"><span className="figures" data-testid="find-cell">{find.cell ?? "–"}</span></Fact>
              {find.position ? <Fact label="Position"><span className="figures">{find.position.x}, {find.position.y}</span></Fact> : null}
              <Fact label={`Depth below surface (${lengthLabel})`}><span className="figures">{find.depthBelowSurface ?? "–"}</span></Fact>
              <Fact label={`Depth within muck (${lengthLabel})`}><span className="figures">{find.depthInMuck ?? "–"}</span></Fact>
              {find.team ? <Fact label="Dive team">{find.team}{find.diveId ? ` (dive #${find.diveId})` : ""}</Fact> : null}
              {find.hold ? <Fact label="Stop-work hold"><Link className="underline" to={`/projects/${projectId}/holds`}>#{find.hold.id}</Link>, {find.hold.lifted ? "lifted" : `in force on ${find.hold.cells.length} cells`}</Fact> : null}
            </>
          ) : (
            <Fact label="Location">Confidential: not shown to your role.</Fact>
          )}
        </dl>
        <p className="text-sm"><Link className="underline" to={`/projects/${projectId}/finds/${find.id}/custody-sheet`}>Printable custody sheet</Link></p>
      </section>

      <section aria-labelledby="photos-heading" className="space-y-3">
        <h3 id="photos-heading" className="text-lg font-semibold">Photos</h3>
        {find.photos.length === 0 ? <p className="text-sm text-muted">No photos yet.</p> : (
          <ul className="grid grid-cols-2 gap-3 sm:grid-cols-4">
            {find.photos.map((photo) => (
              <li key={photo.id} className="rounded border border-line bg-panel p-1 text-xs">
                <a href={photoUrl(photo.id)}><img src={photoUrl(photo.id, true)} alt={`Photo ${photo.originalFileName} of ${find.catalogueNumber}`} className="aspect-[4/3] w-full object-cover" loading="lazy" /></a>
                <p className="mt-1 truncate text-muted">{photo.originalFileName}</p>
                {seesLocations && photo.exif?.latitude != null ? <p className="figures text-muted">GPS {photo.exif.latitude.toFixed(5)}, {photo.exif.longitude?.toFixed(5)}</p> : null}
              </li>
            ))}
          </ul>
        )}
        {loaderData.canLog ? (
          <Form method="post" encType="multipart/form-data" className="space-y-2 rounded border border-line bg-panel p-3">
            <label htmlFor="photo-file" className="block text-sm font-medium">Add a photo</label>
            <p id="photo-reminder" className="text-sm text-caution">Include a scale and the field tag in every photo.</p>
            <input id="photo-file" name="file" type="file" accept="image/jpeg,image/png,image/webp" required aria-describedby="photo-reminder photo-limit" className="block w-full text-sm" />
            <p id="photo-limit" className="text-xs text-muted">JPEG, PNG or WebP, at most {loaderData.photoMaxMegabytes} MB. The stored copy keeps no camera data (no GPS position); the position is kept in the record for those who may see locations.</p>
            {errors.file ? <p className="text-sm text-danger">{errors.file}</p> : null}
            <SubmitButton pendingLabel="Uploading…">Upload photo</SubmitButton>
          </Form>
        ) : null}
      </section>

      <section aria-labelledby="custody-heading" className="space-y-3">
        <h3 id="custody-heading" className="text-lg font-semibold">Chain of custody</h3>
        {find.custody.length === 0 ? <p className="text-sm text-muted">No handovers yet: the find is with {find.currentHolder.name}, {find.currentHolder.place}.</p> : (
          <div className="overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label="Custody handovers, scrollable">
            <table className="w-full border-collapse text-sm" aria-label="Custody handovers">
              <thead>
                <tr className="border-b border-line text-left">
                  <th scope="col" className="py-2 pr-3">When</th><th scope="col" className="py-2 pr-3">From</th><th scope="col" className="py-2 pr-3">To</th>
                  <th scope="col" className="py-2 pr-3">Place</th><th scope="col" className="py-2 pr-3">Purpose</th><th scope="col" className="py-2 pr-3">Signed</th>
                </tr>
              </thead>
              <tbody>
                {find.custody.map((entry) => (
                  <tr key={entry.id} className="border-b border-line" data-testid="custody-row">
                    <td className="figures py-2 pr-3 whitespace-nowrap">{entry.handedAtLocal}</td><td className="py-2 pr-3">{entry.fromName}</td><td className="py-2 pr-3">{entry.toName}</td>
                    <td className="py-2 pr-3">{entry.place}</td><td className="py-2 pr-3">{CUSTODY_PURPOSE_LABELS[entry.purpose]}</td><td className="py-2 pr-3 italic">{entry.receiverSignature}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
        {find.custody.length > 0 ? (
          <div className="space-y-2">
            <h4 className="font-medium">Signed paper forms</h4>
            <ul className="space-y-2">
              {find.custody.map((entry) => {
                const formError = formPhotoFor === entry.id ? errors.formPhoto : undefined;
                const inputId = `form-photo-${entry.id}`;
                return (
                  <li key={entry.id} className="max-w-xl rounded border border-line bg-panel p-3 text-sm" data-testid="custody-form-photo">
                    <p>
                      Handover of <span className="figures whitespace-nowrap">{entry.handedAtLocal}</span> to {entry.toName}
                      {entry.formPhotoId ? ": signed form attached." : ": no photo of the signed form yet."}
                    </p>
                    {entry.formPhotoId ? (
                      <a href={photoUrl(entry.formPhotoId)} className="mt-2 inline-block">
                        <img src={photoUrl(entry.formPhotoId, true)} alt={`Signed custody form, handover to ${entry.toName}`} className="h-24 w-32 rounded border border-line object-cover" loading="lazy" />
                      </a>
                    ) : loaderData.canLog ? (
                      <Form method="post" action={`?custody=${entry.id}`} encType="multipart/form-data" className="mt-2 space-y-2" aria-label={`Attach the signed form of the handover to ${entry.toName}`}>
                        <label htmlFor={inputId} className="block font-medium">Attach signed form photo</label>
                        <input
                          id={inputId} name="file" type="file" accept="image/jpeg,image/png,image/webp" required
                          aria-invalid={formError ? true : undefined} aria-describedby={`${inputId}-hint${formError ? ` ${inputId}-error` : ""}`}
                          className="block w-full text-sm file:mr-3 file:rounded file:border file:border-line file:bg-paper file:px-3 file:py-2"
                        />
                        <p id={`${inputId}-hint`} className="text-xs text-muted">The whole page, flat and readable, with the receiver's signature. JPEG, PNG or WebP, at most {loaderData.photoMaxMegabytes} MB; one per handover.</p>
                        {formError ? <p id={`${inputId}-error`} className="text-danger" role="alert">{formError}</p> : null}
                        <SubmitButton tone="plain" pendingLabel="Uploading…" className="w-full sm:w-auto">Attach photo</SubmitButton>
                      </Form>
                    ) : null}
                  </li>
                );
              })}
            </ul>
          </div>
        ) : null}
        {loaderData.canLog ? (
          <Form method="post" className="max-w-xl space-y-3 rounded border border-line bg-panel p-3">
            <h4 className="font-medium">Record a handover</h4>
            <div className="grid grid-cols-2 gap-3">
              <TextField label="From" name="fromName" required maxLength={120} defaultValue={find.currentHolder.name} error={errors.fromName} />
              <TextField label="To" name="toName" required maxLength={120} error={errors.toName} />
            </div>
            <TextField label="Place it goes to" name="place" required maxLength={200} error={errors.place} />
            <div>
              <label htmlFor="purpose" className="block text-sm font-medium">Purpose</label>
              <select id="purpose" name="purpose" required className={inputClass}>
                {CUSTODY_PURPOSES.map((purpose) => <option key={purpose} value={purpose}>{CUSTODY_PURPOSE_LABELS[purpose]}</option>)}
              </select>
            </div>
            <TextField label="Handed over at (project time)" name="handedAt" type="datetime-local" required defaultValue={loaderData.now} error={errors.handedAt} />
            <TextField label="Receiver's signature" name="receiverSignature" required maxLength={120} hint="The receiver types their full name: it stands as their signature." error={errors.receiverSignature} />
            <TextField label="Note" name="note" maxLength={2000} error={errors.note} />
            <SubmitButton intent="custody" pendingLabel="Recording…">Record handover</SubmitButton>
          </Form>
        ) : null}
      </section>

      {loaderData.canLog ? (
        <section aria-labelledby="status-heading" className="space-y-3">
          <h3 id="status-heading" className="text-lg font-semibold">Status</h3>
          <Form method="post" className="max-w-xl space-y-3 rounded border border-line bg-panel p-3">
            <div>
              <label htmlFor="status" className="block text-sm font-medium">Status</label>
              <select id="status" name="status" defaultValue={find.status} className={inputClass}>
                {FIND_STATUSES.map((status) => <option key={status} value={status}>{FIND_STATUS_LABELS[status]}</option>)}
              </select>
              {errors.status ? <p className="mt-1 text-sm text-danger">{errors.status}</p> : null}
            </div>
            <TextField label="Lab accession no. (when curated)" name="accessionNumber" maxLength={60} defaultValue={find.accessionNumber ?? ""} error={errors.accessionNumber} />
            <TextField label="Note (why released, and where it went)" name="note" maxLength={2000} error={errors.note} />
            <SubmitButton intent="status" tone="plain" pendingLabel="Saving…">Set status</SubmitButton>
          </Form>
        </section>
      ) : null}
    </div>
  );
}
