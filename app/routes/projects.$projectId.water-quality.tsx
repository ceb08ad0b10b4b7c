import { Form, Link, data } from "react-router";
import { z } from "zod";
import { instantOfLocal, localClockOf, localDayOf } from "../../shared/local-time";
import { ActionMessages } from "~/components/form-message";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { localTime } from "~/components/stop-work-banner";
import { requireAllowed, requireRole } from "~/lib/auth/access.server";
import { can } from "~/lib/auth/permissions";
import { DomainError, type ErrorDetail } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { fieldErrorsFrom, type FieldErrors } from "~/lib/http/form";
import { unitLabel } from "../../shared/units";
import {
  agencyNoticeInputSchema, getWaterQualitySettings, listReadings, listStations, listStopWork, readingInputSchema, recordAgencyNotice, recordReading, resumeInputSchema, resumeStopWork,
} from "~/models/water-quality.server";
import { listSightings, listStandDowns, recordSighting, sightingInputSchema } from "~/models/wildlife.server";
import { STAND_DOWN_CAUTION, WATER_QUALITY_CAUTION } from "../../shared/water-quality/wording";
import type { Route } from "./+types/projects.$projectId.water-quality";
import { readPageForm } from "~/lib/http/body.server";
import type { ProjectAccess } from "~/lib/auth/access.server";
import { PHOTO_MAX_BYTES } from "~/lib/images/photo.server";
import { stagePhotoUpload } from "~/lib/images/stored-photo.server";
import { discardStagedFile, UploadRefused, type StagedUpload } from "~/lib/import/stage-upload.server";

// The water-quality page: a phone-friendly reading form with the verdict in words at once, the
// stop-work events with their resumption and agency notice, and wildlife sightings and stand-downs.

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId);
  const { project } = access;
  const nowMs = Date.now();
  const today = localDayOf(nowMs, project.timeZone);
  const [stations, settings, readings, stopWork, sightings, standDowns] = await Promise.all([
    listStations(project), getWaterQualitySettings(project), listReadings(project, {}, { latest: 30 }), listStopWork(project, {}, nowMs), listSightings(project), listStandDowns(project, {}, nowMs),
  ]);
  return {
    projectId: project.id,
    timeZone: project.timeZone,
    lengthLabel: unitLabel(project.lengthUnit),
    nowLocal: `${today}T${localClockOf(nowMs, project.timeZone)}`,
    // One key per rendered form: a reading re-sent (a double tap, a retried request) is stored once.
    formKey: crypto.randomUUID(),
    stations,
    settings,
    readings: readings.reverse(),
    stopWork,
    sightings: sightings.slice(0, 20),
    standDowns: standDowns.slice(0, 20),
    canRecord: can(access, "water-quality.record"),
    canResume: can(access, "stop-work.resume"),
    canSight: can(access, "wildlife.record"),
    canConfigure: can(access, "water-quality.configure"),
    photoMaxMegabytes: PHOTO_MAX_BYTES / 1024 / 1024,
  };
}

/** A form's number field: empty is null, anything else must read as a number (the schema names it otherwise). */
const optionalNumber = (value: string | null) => (value === null || String(value).trim() === "" ? null : Number(String(value).trim()));
const text = (value: string | null) => (value === null ? "" : String(value));

/** A datetime-local value (project wall time, YYYY-MM-DDTHH:MM) as an ISO instant; the text itself when it does not read. */
function instantFromLocal(value: string, timeZone: string): string {
  const match = /^(\d{4}-\d{2}-\d{2})T(\d{2}):(\d{2})$/.exec(value.trim());
  if (!match) return value;
  return new Date(instantOfLocal(match[1], Number(match[2]) * 60 + Number(match[3]), timeZone)).toISOString();
}

type ActionResult = { intent: string; errors: FieldErrors; notice: string | null; verdict: { text: string; exceeds: boolean | null } | null };

function refused(intent: string, details: readonly ErrorDetail[], status = 400) {
  return data<ActionResult>({ intent, errors: fieldErrorsFrom(details, (field) => field.split(".")[0]), notice: null, verdict: null }, { status });
}

export async function action({ request, params }: Route.ActionArgs) {
  const access = await requireRole(request, params.projectId);
  // The reading form carries its photo, so it is multipart (staged within the photo limit, and only
  // for a role that takes readings); the other forms are url-encoded, read within the page-form limit.
  let staged: StagedUpload;
  if ((request.headers.get("Content-Type") ?? "").toLowerCase().startsWith("multipart/form-data")) {
    requireAllowed(access, "water-quality.record");
    try {
      staged = await stagePhotoUpload(request);
    } catch (error) {
      if (error instanceof UploadRefused) return refused("reading", [{ field: "file", message: error.message }]);
      throw error;
    }
  } else {
    staged = { fields: Object.fromEntries([...(await readPageForm(request)).entries()].filter((entry): entry is [string, string] => typeof entry[1] === "string")), file: null };
  }
  try {
    return await act(access, staged, clientAddress(request));
  } finally {
    if (staged.file) await discardStagedFile(staged.file.path);
  }
}

async function act(access: ProjectAccess, staged: StagedUpload, ip: string | null) {
  const form = { get: (name: string): string | null => staged.fields[name] ?? null };
  const intent = text(form.get("intent"));
  const actionOf = { reading: "water-quality.record", resume: "stop-work.resume", notice: "stop-work.resume", sighting: "wildlife.record" } as const;
  if (!(intent in actionOf)) {
    // A role that may do nothing here is refused before its form is looked at.
    if (!Object.values(actionOf).some((needed) => can(access, needed))) requireAllowed(access, "water-quality.record");
    return refused("invalid", [{ message: "Unknown action." }]);
  }
  requireAllowed(access, actionOf[intent as keyof typeof actionOf]);
  const { project, user } = access;
  try {
    if (intent === "reading") {
      if (staged.emptyFileName) return refused(intent, [{ field: "file", message: `"${staged.emptyFileName}" is an empty file; choose the photo again.` }]);
      const parsed = readingInputSchema.safeParse({
        station: text(form.get("station")), takenAt: instantFromLocal(text(form.get("takenAt")), project.timeZone), value: optionalNumber(form.get("value")), unit: text(form.get("unit")),
        depth: optionalNumber(form.get("depth")), instrument: text(form.get("instrument")), calibratedAt: text(form.get("calibratedAt")) ? instantFromLocal(text(form.get("calibratedAt")), project.timeZone) : null,
        sampledBy: text(form.get("sampledBy")), note: text(form.get("note")), ph: optionalNumber(form.get("ph")), dissolvedOxygen: optionalNumber(form.get("dissolvedOxygen")),
        temperature: optionalNumber(form.get("temperature")), idempotencyKey: text(form.get("idempotencyKey")) || null,
      });
      if (!parsed.success) return refused(intent, parsed.error.issues.map((issue) => ({ field: issue.path.map(String).join("."), message: issue.message })));
      const recorded = await recordReading(project, user, parsed.data, ip, { photo: staged.file });
      const saved = recorded.photoId !== undefined ? "Reading saved with its photo." : "Reading saved.";
      return { intent, errors: {}, notice: recorded.stopWork ? `${saved} Work is stopped; the manager, the dive supervisor and the dewatering operator were e-mailed.` : saved, verdict: { text: recorded.verdict, exceeds: recorded.evaluation?.exceeds ?? null } } satisfies ActionResult;
    }
    if (intent === "resume") {
      const parsed = resumeInputSchema.safeParse({ note: text(form.get("note")) });
      if (!parsed.success) return refused(intent, parsed.error.issues.map((issue) => ({ field: "resumeNote", message: issue.message })));
      await resumeStopWork(project, user, Number(form.get("eventId")), parsed.data.note, ip);
      return { intent, errors: {}, notice: "Resumption recorded: work may resume.", verdict: null } satisfies ActionResult;
    }
    if (intent === "notice") {
      const parsed = agencyNoticeInputSchema.safeParse({ notifiedAt: instantFromLocal(text(form.get("notifiedAt")), project.timeZone), to: text(form.get("to")), how: text(form.get("how")) });
      if (!parsed.success) return refused(intent, parsed.error.issues.map((issue) => ({ field: issue.path.map(String).join("."), message: issue.message })));
      await recordAgencyNotice(project, user, Number(form.get("eventId")), parsed.data, ip);
      return { intent, errors: {}, notice: "Agency notification recorded.", verdict: null } satisfies ActionResult;
    }
    const gone = form.get("gone") === "on" || form.get("gone") === "true";
    const parsed = sightingInputSchema.safeParse({
      species: text(form.get("species")), seenAt: instantFromLocal(text(form.get("seenAt")), project.timeZone), distance: gone && !text(form.get("distance")) ? null : optionalNumber(form.get("distance")),
      gone, observer: text(form.get("observer")), note: text(form.get("note")),
    });
    if (!parsed.success) return refused(intent, parsed.error.issues.map((issue) => ({ field: issue.path.map(String).join("."), message: issue.message })));
    const recorded = await recordSighting(project, user, parsed.data, ip);
    const notice = recorded.standDown
      ? recorded.standDown.until
        ? `Sighting saved. The stand-down ends at ${localTime(recorded.standDown.until, project.timeZone)} unless the animal comes back.`
        : "Sighting saved. STAND-DOWN: stop in-water equipment until the animal leaves on its own and the wait has passed."
      : "Sighting saved (beyond the shutdown distance: no stand-down).";
    return { intent, errors: {}, notice, verdict: null } satisfies ActionResult;
  } catch (error) {
    // A refused photo (not an image, unreadable) is the form's mistake; the rest is the state of the project.
    if (error instanceof DomainError) return refused(intent, error.details, error.details.some((detail) => detail.field === "file") ? 400 : 409);
    throw error;
  }
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Water quality · Firmsand" }];
}

const inputClass = "mt-1 block w-full rounded border border-line bg-panel px-3 py-2 focus:outline-2 focus:outline-offset-1 focus:outline-lagoon";

function Verdict({ verdict }: { verdict: { text: string; exceeds: boolean | null } }) {
  const style = verdict.exceeds === true ? "border-danger bg-danger text-white" : verdict.exceeds === false ? "border-ok bg-[#eaf5ec] text-ok" : "border-caution bg-[#fff7e8] text-caution";
  return <p role="status" data-testid="reading-verdict" className={`rounded border-2 p-3 text-lg font-semibold ${style}`}>{verdict.text}</p>;
}

export default function WaterQuality({ loaderData, actionData }: Route.ComponentProps) {
  const { projectId, timeZone, stations, settings } = loaderData;
  const errors: FieldErrors = actionData?.errors ?? {};
  const errorsFor = (intent: string) => (actionData?.intent === intent ? errors : {});
  const readingErrors = errorsFor("reading");
  const sightingErrors = errorsFor("sighting");
  return (
    <div className="space-y-8">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h2 className="text-xl font-semibold">Water quality</h2>
        <p className="flex gap-3 text-sm">
          <Link to={`/projects/${projectId}/water-quality/compliance`} className="text-lagoon underline">Compliance table and charts</Link>
          {loaderData.canConfigure ? <Link to={`/projects/${projectId}/water-quality/setup`} className="text-lagoon underline">Stations, rules and settings</Link> : null}
        </p>
      </div>
      <p role="note" className="rounded border border-caution bg-[#fff7e8] p-2 text-sm text-caution">{WATER_QUALITY_CAUTION}</p>
      <ActionMessages error={errors.form} notice={actionData?.notice} />
      {actionData?.verdict ? <Verdict verdict={actionData.verdict} /> : null}

      {loaderData.canRecord ? (
        <section aria-labelledby="reading-heading" className="max-w-xl">
          <h3 id="reading-heading" className="text-lg font-semibold">Record a reading</h3>
          {stations.length === 0 ? (
            <p className="mt-2 text-sm text-muted">No monitoring stations yet: the manager sets them up first.</p>
          ) : (
            <Form method="post" encType="multipart/form-data" className="mt-3 space-y-3" key={actionData?.intent === "reading" && actionData.verdict ? actionData.verdict.text : "reading"}>
              <input type="hidden" name="idempotencyKey" value={loaderData.formKey} />
              <div>
                <label htmlFor="station" className="block text-sm font-medium">Station</label>
                <select id="station" name="station" className={inputClass} aria-invalid={readingErrors.station ? true : undefined}>
                  {stations.map((station) => <option key={station.id} value={station.name}>{station.name} ({station.kind})</option>)}
                </select>
                {readingErrors.station ? <p className="mt-1 text-sm text-danger">{readingErrors.station}</p> : null}
              </div>
              <TextField label={`Taken at (project time, ${timeZone})`} name="takenAt" type="datetime-local" required defaultValue={loaderData.nowLocal} error={readingErrors.takenAt} />
              <div className="grid grid-cols-2 gap-3">
                <TextField label="Turbidity" name="value" inputMode="decimal" required error={readingErrors.value} />
                <div>
                  <label htmlFor="unit" className="block text-sm font-medium">Unit</label>
                  <select id="unit" name="unit" className={inputClass} defaultValue="NTU"><option>NTU</option><option>FNU</option></select>
                  {readingErrors.unit ? <p className="mt-1 text-sm text-danger">{readingErrors.unit}</p> : null}
                </div>
              </div>
              <details className="rounded border border-line bg-panel p-3">
                <summary className="cursor-pointer text-sm font-medium">Depth, instrument, calibration, sampler, other measures, note</summary>
                <div className="mt-3 space-y-3">
                  <TextField label={`Sample depth (${loaderData.lengthLabel})`} name="depth" inputMode="decimal" error={readingErrors.depth} />
                  <TextField label="Instrument" name="instrument" maxLength={120} error={readingErrors.instrument} />
                  <TextField label="Last calibration check (project time)" name="calibratedAt" type="datetime-local" error={readingErrors.calibratedAt} />
                  <TextField label="Sampled by" name="sampledBy" maxLength={120} hint="Your name if left empty." error={readingErrors.sampledBy} />
                  <div className="grid grid-cols-3 gap-3">
                    <TextField label="pH" name="ph" inputMode="decimal" error={readingErrors.ph} />
                    <TextField label="DO (mg/L)" name="dissolvedOxygen" inputMode="decimal" error={readingErrors.dissolvedOxygen} />
                    <TextField label="Temp. (°C)" name="temperature" inputMode="decimal" error={readingErrors.temperature} />
                  </div>
                  <label className="block text-sm font-medium">Note<textarea name="note" maxLength={4000} rows={2} className={inputClass} /></label>
                </div>
              </details>
              <div>
                <label htmlFor="reading-photo" className="block text-sm font-medium">Photo (optional)</label>
                <input id="reading-photo" name="file" type="file" accept="image/jpeg,image/png,image/webp" aria-describedby="reading-photo-hint" aria-invalid={readingErrors.file ? true : undefined} className="mt-1 block w-full text-base" />
                <p id="reading-photo-hint" className="mt-1 text-xs text-muted">The sample, the instrument's display or the water at the station. JPEG, PNG or WebP, at most {loaderData.photoMaxMegabytes} MB; kept without its camera data (no location). A refused photo saves nothing: choose another or none and save again.</p>
                {readingErrors.file ? <p className="mt-1 text-sm text-danger">{readingErrors.file}</p> : null}
              </div>
              <SubmitButton intent="reading" pendingLabel="Saving…" className="w-full sm:w-auto">Save reading</SubmitButton>
            </Form>
          )}
        </section>
      ) : null}

      <section aria-labelledby="stop-work-heading">
        <h3 id="stop-work-heading" className="text-lg font-semibold">Stop-work events</h3>
        {loaderData.stopWork.length === 0 ? <p className="mt-2 text-sm text-muted">None recorded.</p> : (
          <ul className="mt-2 space-y-3">
            {loaderData.stopWork.map((event) => (
              <li key={event.id} data-testid={`stop-work-${event.id}`} className={`rounded border p-3 text-sm ${event.open ? "border-danger bg-panel" : "border-line bg-panel"}`}>
                <p className="font-semibold">{event.open ? "OPEN" : "Closed"} · {event.station} · {event.reading.value} {event.reading.unit}{event.reading.limit !== null ? ` over a limit of ${event.reading.limit}` : ""} · since {localTime(event.openedAt, timeZone)} · {event.durationHours} h</p>
                <p>Agency notice due by {localTime(event.notifyBy, timeZone)}: {event.agencyNotified ? `given ${localTime(event.agencyNotified.at, timeZone)} to ${event.agencyNotified.to} (${event.agencyNotified.how})` : "not yet recorded"}.</p>
                {event.resumedAt ? <p>Resumed {localTime(event.resumedAt, timeZone)}: {event.resumeNote}</p> : null}
                {event.open && loaderData.canResume ? (
                  <div className="mt-2 grid gap-3 md:grid-cols-2">
                    {!event.agencyNotified ? (
                      <Form method="post" className="space-y-2 rounded border border-line p-2">
                        <input type="hidden" name="eventId" value={event.id} />
                        <TextField label="Agency told at (project time)" name="notifiedAt" type="datetime-local" required defaultValue={loaderData.nowLocal} error={errorsFor("notice").notifiedAt} />
                        <TextField label="To whom" name="to" required maxLength={200} error={errorsFor("notice").to} />
                        <TextField label="How" name="how" required maxLength={200} hint="Telephone, e-mail, the agency's form…" error={errorsFor("notice").how} />
                        <SubmitButton intent="notice" tone="plain" pendingLabel="Saving…">Record the agency notice</SubmitButton>
                      </Form>
                    ) : null}
                    <Form method="post" className="space-y-2 rounded border border-line p-2">
                      <input type="hidden" name="eventId" value={event.id} />
                      <label className="block text-sm font-medium">Resumption note<textarea name="note" required rows={2} className={inputClass} /></label>
                      {errorsFor("resume").resumeNote ? <p className="text-sm text-danger">{errorsFor("resume").resumeNote}</p> : null}
                      <p className="text-xs text-muted">Accepted only after a resample at {event.station} within the limit.</p>
                      <SubmitButton intent="resume" pendingLabel="Saving…">Record resumption</SubmitButton>
                    </Form>
                  </div>
                ) : null}
              </li>
            ))}
          </ul>
        )}
      </section>

      <section aria-labelledby="recent-heading">
        <h3 id="recent-heading" className="text-lg font-semibold">Latest readings</h3>
        {loaderData.readings.length === 0 ? <p className="mt-2 text-sm text-muted">None.</p> : (
          <div className="mt-2 overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label="Latest readings, scrollable">
            <table className="w-full text-sm">
              <thead><tr className="border-b border-line text-left"><th className="py-1 pr-3">Time</th><th className="pr-3">Station</th><th className="pr-3 text-right">Value</th><th className="pr-3">Verdict</th><th className="pr-3">Sampled by</th><th>Photo</th></tr></thead>
              <tbody>
                {loaderData.readings.map((reading) => (
                  <tr key={reading.id} className="border-b border-line align-top">
                    <td className="py-1 pr-3 whitespace-nowrap">{localTime(reading.takenAt, timeZone)}</td>
                    <td className="pr-3">{reading.station}</td>
                    <td className="figures pr-3 text-right whitespace-nowrap">{reading.value} {reading.unit}</td>
                    <td className={`pr-3 ${reading.evaluation?.exceeds ? "font-semibold text-danger" : reading.evaluation?.exceeds === null ? "text-caution" : ""}`}>{reading.verdict ?? "—"}</td>
                    <td className="pr-3">{reading.sampledBy}</td>
                    <td className="py-1">
                      {reading.photos.length === 0 ? <span className="text-muted">—</span> : (
                        <ul className="flex gap-1">
                          {reading.photos.map((photo) => (
                            <li key={photo.id}>
                              <a href={`/api/projects/${projectId}/water-quality/readings/${reading.id}/photos/${photo.id}`} className="block focus-visible:outline-2 focus-visible:outline-lagoon">
                                <img src={`/api/projects/${projectId}/water-quality/readings/${reading.id}/photos/${photo.id}?size=thumb`} alt={`Photo of the reading at ${reading.station}, ${localTime(reading.takenAt, timeZone)}: ${photo.originalFileName}`} width={64} height={48} className="h-12 w-16 rounded border border-line object-cover" loading="lazy" />
                              </a>
                            </li>
                          ))}
                        </ul>
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </section>

      <section aria-labelledby="wildlife-heading" className="space-y-3">
        <h3 id="wildlife-heading" className="text-lg font-semibold">Wildlife sightings and stand-downs</h3>
        <p role="note" className="rounded border border-caution bg-[#fff7e8] p-2 text-sm text-caution">
          {STAND_DOWN_CAUTION} This project: within {settings.shutdownDistance} {loaderData.lengthLabel}, wait {settings.standDownWaitMinutes} min after it leaves ({settings.standDownSource})
        </p>
        {loaderData.canSight ? (
          <Form method="post" className="max-w-xl space-y-3" key={actionData?.intent === "sighting" && actionData.notice ? actionData.notice : "sighting"}>
            <div className="grid grid-cols-2 gap-3">
              <div>
                <label htmlFor="species" className="block text-sm font-medium">Species</label>
                <select id="species" name="species" className={inputClass}>{settings.species.map((name) => <option key={name}>{name}</option>)}</select>
                {sightingErrors.species ? <p className="mt-1 text-sm text-danger">{sightingErrors.species}</p> : null}
              </div>
              <TextField label={`Distance (${loaderData.lengthLabel})`} name="distance" inputMode="decimal" error={sightingErrors.distance} />
            </div>
            <label className="flex items-center gap-2 text-sm"><input type="checkbox" name="gone" /> The animal has left (out of sight, or moved away on its own)</label>
            <TextField label={`Seen at (project time, ${timeZone})`} name="seenAt" type="datetime-local" required defaultValue={loaderData.nowLocal} error={sightingErrors.seenAt} />
            <TextField label="Observer" name="observer" required maxLength={120} error={sightingErrors.observer} />
            <SubmitButton intent="sighting" pendingLabel="Saving…" className="w-full sm:w-auto">Save sighting</SubmitButton>
          </Form>
        ) : null}
        {loaderData.standDowns.length === 0 ? <p className="text-sm text-muted">No stand-downs recorded.</p> : (
          <ul className="space-y-1 text-sm">
            {loaderData.standDowns.map((standDown) => (
              <li key={standDown.id} data-testid={`stand-down-${standDown.id}`}>
                <span className={standDown.active ? "font-semibold text-danger" : ""}>{standDown.active ? "IN FORCE" : "Ended"}</span> · {standDown.species} · from {localTime(standDown.startedAt, timeZone)}
                {standDown.until ? ` to ${localTime(standDown.until, timeZone)}` : " · animal still near"} · {standDown.durationHours} h lost
              </li>
            ))}
          </ul>
        )}
        {loaderData.sightings.length > 0 ? (
          <details className="text-sm"><summary className="cursor-pointer">Recent sightings ({loaderData.sightings.length})</summary>
            <ul className="mt-1 space-y-1">
              {loaderData.sightings.map((sighting) => <li key={sighting.id}>{localTime(sighting.seenAt, timeZone)} · {sighting.species} · {sighting.gone ? "gone" : `${sighting.distance} ${loaderData.lengthLabel}`} · {sighting.observer}</li>)}
            </ul>
          </details>
        ) : null}
      </section>
    </div>
  );
}
