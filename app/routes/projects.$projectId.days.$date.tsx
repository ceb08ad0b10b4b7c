import { useState } from "react";
import { Form, Link, data } from "react-router";
import { z } from "zod";
import { EQUIPMENT_MAX_LINES } from "../../shared/daily-report/compile";
import { countersignOutdatedLine, earlierCountersignatureLine, weatherLine } from "../../shared/daily-report/present";
import { localClockOf, localDayOf } from "../../shared/local-time";
import { unitLabel } from "../../shared/units";
import { DailyReportFigures, EquipmentHours, InspectionsAndVisitors, Section } from "~/components/daily-report-figures";
import { CrewsForm, VisitorsForm, WeatherDowntimeForm } from "~/components/daily-report-forms";
import { ActionMessages } from "~/components/form-message";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { pageParam, requireRole } from "~/lib/auth/access.server";
import { can } from "~/lib/auth/permissions";
import { ConflictError, DomainError, detailsOf } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { fieldErrorsFrom } from "~/lib/http/form";
import { readPageForm } from "~/lib/http/body.server";
import { appOrigin } from "~/lib/http/origin.server";
import { mailStates } from "~/lib/mail/outbox.server";
import {
  addAmendment, amendmentInputSchema, countersignRequestInputSchema, crewsInputSchema, dayParam, earlierEquipmentNames, enteredNotesInputSchema, equipmentInputSchema, getDailyReport, hoursInDay, openCountersignRequest, projectTeamNames,
  requestCountersign, saveCrews, saveEnteredNotes, saveEquipment, saveVisitors, saveWeatherDowntime, signDailyReport, signInputSchema, visitorsInputSchema, weatherDowntimeInputSchema,
} from "~/models/daily-reports.server";
import type { Route } from "./+types/projects.$projectId.days.$date";

// A day's report on screen: what is missing first, then the compiled sections, the entered
// weather and notes (until signed), the typed-name signature and the amendments after it.

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId, "reports.read");
  const date = pageParam(() => dayParam(params.date));
  const view = await getDailyReport(access.project, date);
  const canSign = can(access, "reports.sign");
  const pending = view.signed && (!view.countersigned || view.countersignOutdated) && canSign ? await openCountersignRequest(access.project, date) : null;
  const pendingMail = pending ? (await mailStates([pending.mailRef])).get(pending.mailRef)?.status ?? null : null;
  // A day with no equipment yet starts from the names on the latest earlier report (hours left to fill in).
  const equipmentNames = canSign && !view.signed && (view.report.entered.equipment ?? []).length === 0 ? await earlierEquipmentNames(access.project, date) : [];
  // The teams the head-count form offers beside those of the day's records: the project's teams in service.
  const teamNames = canSign && !view.signed ? await projectTeamNames(access.project, { inService: true }) : [];
  return { ...view, equipmentNames, teamNames, dayHours: hoursInDay(access.project, date), countersignPending: pending ? { email: pending.email, expiresAt: pending.expiresAt, mail: pendingMail } : null, projectId: access.project.id, timeZone: access.project.timeZone, lengthUnit: access.project.lengthUnit, lengthLabel: unitLabel(access.project.lengthUnit), canSign: can(access, "reports.sign"), canConfigureStations: can(access, "water-quality.configure"), signerName: access.user.name };
}

const formSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("notes") }).passthrough(),
  z.object({ intent: z.literal("equipment") }).passthrough(),
  z.object({ intent: z.literal("crews") }).passthrough(),
  z.object({ intent: z.literal("weather-downtime") }).passthrough(),
  z.object({ intent: z.literal("visitors") }).passthrough(),
  z.object({ intent: z.literal("sign"), name: z.string() }),
  z.object({ intent: z.literal("amend"), text: z.string() }),
  z.object({ intent: z.literal("countersign-request"), email: z.string() }),
]);

/**
 * The lines of one list on the form, `<list>.<n>.<field>` in the order of <n>; a line whose entered
 * fields are all blank is left out (`given`: a field the page fills in itself, such as a crew's team,
 * does not count). `numbers` are read as numbers (a decimal comma taken); `formIndex` is the line's
 * <n>, for its errors.
 */
function linesFromForm(form: FormData, list: string, fields: readonly string[], numbers: readonly string[] = [], given: readonly string[] = []) {
  const text = (name: string) => {
    const value = form.get(name);
    return typeof value === "string" && value.trim() !== "" ? value.trim() : undefined;
  };
  const pattern = new RegExp(`^${list}\\.(\\d{1,4})\\.`);
  const indexes = [...new Set([...form.keys()].flatMap((key) => pattern.exec(key)?.[1] ?? []).map(Number))].sort((a, b) => a - b);
  return indexes.flatMap((index) => {
    const field = (name: string) => `${list}.${index}.${name}`;
    if (fields.filter((name) => !given.includes(name)).every((name) => text(field(name)) === undefined)) return [];
    const line: Record<string, unknown> = Object.fromEntries(fields.map((name) => {
      const value = text(field(name));
      return [name, value !== undefined && numbers.includes(name) ? Number(value.replace(",", ".")) : value];
    }));
    return [{ line, formIndex: index }];
  });
}

/** A line's error said on its own field on the form, `<list>.<position on the form>.<field>`; the list's own (too many lines) at the top. */
const onFormLine = (list: string, lines: ReadonlyArray<{ formIndex: number }>) => (field: string) => {
  const [head, index, name] = field.split(".");
  return head === list && index !== undefined && name !== undefined ? `${list}.${lines[Number(index)]?.formIndex ?? index}.${name}` : "form";
};

export async function action({ request, params }: Route.ActionArgs) {
  const { project, user } = await requireRole(request, params.projectId, "reports.sign");
  const date = pageParam(() => dayParam(params.date));
  const body = await readPageForm(request);
  const form = formSchema.safeParse(Object.fromEntries(body));
  if (!form.success) return data({ errors: { form: "That request is not one this page makes." } as Record<string, string>, notice: null }, { status: 400 });
  const input = form.data;
  const refused = (errors: Record<string, string>, status = 400) => data({ errors, notice: null }, { status });
  try {
    if (input.intent === "notes") {
      const parsed = enteredNotesInputSchema.safeParse(input);
      if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), (field) => field));
      await saveEnteredNotes(project, user, date, parsed.data, clientAddress(request));
      return { errors: {}, notice: "Weather and notes saved." };
    }
    if (input.intent === "equipment") {
      const lines = linesFromForm(body, "equipment", ["name", "workingHours", "idleHours", "idleReason"], ["workingHours", "idleHours"]);
      const parsed = equipmentInputSchema(hoursInDay(project, date)).safeParse({ equipment: lines.map(({ line }) => line) });
      if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), onFormLine("equipment", lines)));
      await saveEquipment(project, user, date, parsed.data, clientAddress(request));
      return { errors: {}, notice: parsed.data.equipment.length === 0 ? "Equipment hours cleared." : "Equipment hours saved." };
    }
    if (input.intent === "crews") {
      const lines = linesFromForm(body, "crews", ["team", "headCount", "reason"], ["headCount"], ["team"]);
      const parsed = crewsInputSchema(await projectTeamNames(project)).safeParse({ crews: lines.map(({ line }) => line) });
      if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), onFormLine("crews", lines)));
      await saveCrews(project, user, date, parsed.data, clientAddress(request));
      return { errors: {}, notice: parsed.data.crews.length === 0 ? "Head counts back to the compiled ones." : "Head counts saved." };
    }
    if (input.intent === "weather-downtime") {
      const lines = linesFromForm(body, "weatherDowntime", ["start", "end", "reason"]);
      const parsed = weatherDowntimeInputSchema(date, project.timeZone).safeParse({ weatherDowntime: lines.map(({ line }) => line) });
      if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), onFormLine("weatherDowntime", lines)));
      await saveWeatherDowntime(project, user, date, parsed.data, clientAddress(request));
      return { errors: {}, notice: parsed.data.weatherDowntime.length === 0 ? "Weather downtime cleared." : "Weather downtime saved." };
    }
    if (input.intent === "visitors") {
      const lines = linesFromForm(body, "visitors", ["arrived", "left", "name", "organisation", "purpose"]);
      const parsed = visitorsInputSchema(date, project.timeZone).safeParse({ visitors: lines.map(({ line }) => line) });
      if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), onFormLine("visitors", lines)));
      await saveVisitors(project, user, date, parsed.data, clientAddress(request));
      return { errors: {}, notice: parsed.data.visitors.length === 0 ? "Inspections and visitors cleared." : "Inspections and visitors saved." };
    }
    if (input.intent === "sign") {
      const parsed = signInputSchema.safeParse({ name: input.name });
      if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), (field) => field));
      const signed = await signDailyReport(project, user, date, parsed.data.name, clientAddress(request));
      return { errors: {}, notice: signed.pdfPending
        ? "Signed: the report is locked; corrections are amendments. Its PDF is being prepared: the file storage is not answering, so it is retried and sent to the subscribers once stored."
        : "Signed: the report is locked; corrections are amendments." };
    }
    if (input.intent === "countersign-request") {
      const parsed = countersignRequestInputSchema.safeParse({ email: input.email });
      if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), (field) => field));
      const sent = await requestCountersign(project, user, date, parsed.data.email, appOrigin(), clientAddress(request));
      return { errors: {}, notice: `A one-time countersign link goes to ${sent.email} now.` };
    }
    const parsed = amendmentInputSchema.safeParse({ text: input.text });
    if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), (field) => field));
    await addAmendment(project, user, date, parsed.data.text, clientAddress(request));
    return { errors: {}, notice: "Amendment added." };
  } catch (error) {
    if (error instanceof ConflictError) return refused({ form: error.message }, 409);
    if (error instanceof DomainError) return refused(fieldErrorsFrom(error.details, (field) => field));
    throw error;
  }
}

export function meta({ loaderData }: Route.MetaArgs) {
  return [{ title: `Daily report ${loaderData?.date ?? ""} · Firmsand` }];
}


export default function DailyReportPage({ loaderData, actionData }: Route.ComponentProps) {
  const { report, signed, countersigned, countersignPending, countersignOutdated, earlierCountersignatures, amendments, canSign, projectId, date, timeZone } = loaderData;
  const errors: Record<string, string> = actionData?.errors ?? {};
  const weather = report.entered.weather;
  // Times in the project's zone, as the PDF and the countersign page give them.
  const local = (iso: string) => <time className="figures whitespace-nowrap" dateTime={iso}>{localDayOf(Date.parse(iso), timeZone)} {localClockOf(Date.parse(iso), timeZone)}</time>;
  return (
    <div className="space-y-4">
      <ActionMessages error={errors.form} notice={actionData?.notice} />
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <h2 className="text-lg font-semibold">Daily report · <span className="figures">{date}</span></h2>
        <p className="text-sm print:hidden">
          <Link className="underline" to={`/projects/${projectId}/days?month=${date.slice(0, 7)}`}>All days</Link> · <a className="underline" href={`/projects/${projectId}/days/${date}/report.pdf`} download>Download PDF</a> · <button type="button" className="underline" onClick={() => window.print()}>Print</button>
        </p>
      </div>
      <p className="text-sm text-muted">Local day in {timeZone}. {signed ? <>Figures as signed by <strong>{signed.name}</strong> at {local(signed.at)}.</> : "Draft: figures compiled from the records as they stand now."}</p>

      {report.missing.length > 0 ? (
        <div role="status" className="rounded border border-danger bg-panel p-3 text-sm" data-testid="missing">
          <p className="font-medium text-danger">Missing</p>
          <ul className="list-disc pl-5">{report.missing.map((item) => <li key={item}>{item}</li>)}</ul>
        </div>
      ) : null}

      <Section title="Weather and notes">
        {weatherLine(weather) ? (
          <p className="text-sm">{weatherLine(weather)}{weather?.effect ? <> — effect on the work: {weather.effect}</> : null}</p>
        ) : <p className="text-sm text-muted">No weather entered.</p>}
        <p className="mt-1 text-sm"><span className="font-medium">Safety (toolbox talk, incidents):</span> {report.entered.safety || <span className="text-muted">none entered.</span>}</p>
        {report.entered.notes ? <p className="mt-1 text-sm"><span className="font-medium">Notes:</span> {report.entered.notes}</p> : null}
        <p className="mt-1 text-xs text-muted">Incidents are reported as the project's safety plan directs; this report records them, it does not replace that reporting.</p>
        {canSign && !signed ? (
          <Form method="post" className="mt-3 grid gap-3 md:grid-cols-2 print:hidden" data-testid="notes-form">
            <TextField label="Conditions" name="conditions" maxLength={200} defaultValue={weather?.conditions ?? ""} error={errors.conditions} />
            <TextField label="Air temperature" name="airTemperature" maxLength={60} defaultValue={weather?.airTemperature ?? ""} error={errors.airTemperature} />
            <TextField label="Wind" name="wind" maxLength={120} defaultValue={weather?.wind ?? ""} error={errors.wind} />
            <TextField label="Rain" name="rain" maxLength={120} defaultValue={weather?.rain ?? ""} error={errors.rain} />
            <TextField className="md:col-span-2" label="Effect on the work" name="effect" maxLength={2000} defaultValue={weather?.effect ?? ""} error={errors.effect} />
            {/* The free-text note of a report begun before visitors had lines stays editable (e.g. cleared once moved into lines); new days have none. */}
            {report.entered.inspections ? <TextField className="md:col-span-2" label="Earlier note on inspections and visitors" name="inspections" maxLength={4000} defaultValue={report.entered.inspections} error={errors.inspections} hint="Entered as text before visitors had their own lines below; move it into lines and clear it, or keep it." /> : null}
            <TextField className="md:col-span-2" label="Safety (toolbox talk, incidents)" name="safety" maxLength={4000} defaultValue={report.entered.safety} error={errors.safety} />
            <TextField className="md:col-span-2" label="Other notes" name="notes" maxLength={4000} defaultValue={report.entered.notes} error={errors.notes} />
            <div><SubmitButton intent="notes" tone="plain" pendingLabel="Saving…">Save weather and notes</SubmitButton></div>
          </Form>
        ) : null}
      </Section>

      <Section title="Equipment">
        <EquipmentHours equipment={report.entered.equipment} />
        {canSign && !signed ? <EquipmentForm key={JSON.stringify(report.entered.equipment ?? [])} saved={report.entered.equipment ?? []} names={loaderData.equipmentNames} dayHours={loaderData.dayHours} errors={errors} /> : null}
      </Section>

      <Section title="Inspections and visitors">
        <InspectionsAndVisitors entered={report.entered} />
        {canSign && !signed ? <VisitorsForm key={JSON.stringify(report.entered.visitors ?? [])} saved={report.entered.visitors ?? []} errors={errors} timeZone={timeZone} /> : null}
      </Section>

      <DailyReportFigures
        report={report} timeZone={timeZone} lengthUnit={loaderData.lengthUnit}
        stationSetupHref={loaderData.canConfigureStations ? `/projects/${projectId}/water-quality/setup#stations-heading` : undefined}
        crewsEditor={canSign && !signed && (report.teams.length > 0 || loaderData.teamNames.length > 0) ? <CrewsForm key={JSON.stringify(report.entered.crews ?? [])} teams={report.teams} teamNames={loaderData.teamNames} saved={report.entered.crews ?? []} errors={errors} /> : null}
        interruptionsEditor={canSign && !signed ? <WeatherDowntimeForm key={JSON.stringify(report.entered.weatherDowntime ?? [])} saved={report.entered.weatherDowntime ?? []} errors={errors} timeZone={timeZone} /> : null}
      />

      <Section title="Sign-off">
        {signed ? (
          <p className="text-sm" data-testid="signed">Signed by <strong>{signed.name}</strong> at {local(signed.at)}. Locked.</p>
        ) : canSign ? (
          <Form method="post" className="flex flex-wrap items-end gap-3 print:hidden">
            <TextField label="Your name (typed, as your signature)" name="name" required maxLength={200} defaultValue={loaderData.signerName} error={errors.name} />
            <SubmitButton intent="sign" pendingLabel="Signing…">Sign the report</SubmitButton>
          </Form>
        ) : <p className="text-sm text-muted">Not signed yet.</p>}
        {loaderData.pdfPending ? (
          <p role="status" className="mt-2 rounded border border-caution bg-paper p-2 text-sm" data-testid="pdf-pending">
            PDF being prepared: the file storage did not answer ({loaderData.pdfPending.attempts} {loaderData.pdfPending.attempts === 1 ? "attempt" : "attempts"} so far; next at <time className="figures" dateTime={loaderData.pdfPending.nextAttemptAt}>{localClockOf(Date.parse(loaderData.pdfPending.nextAttemptAt), timeZone)}</time>).
            The signature is kept; the subscribers receive the signed PDF once it is stored. Download PDF still gives the signed report now.
          </p>
        ) : null}
        {countersigned ? (
          <p className="mt-2 text-sm" data-testid="countersigned">Countersigned by <strong>{countersigned.name}</strong> (agency inspector, {countersigned.email}) at {local(countersigned.at)}.</p>
        ) : signed ? <p className="mt-2 text-sm text-muted">Not countersigned by the agency's inspector yet.</p> : null}
        {countersignOutdated ? <p className="mt-1 text-sm text-caution" data-testid="countersign-outdated">{countersignOutdatedLine()}</p> : null}
        {earlierCountersignatures.length > 0 ? (
          <ul className="mt-1 space-y-1 text-sm text-muted" data-testid="earlier-countersignatures">
            {earlierCountersignatures.map((earlier) => <li key={earlier.at}>{earlierCountersignatureLine(earlier, (iso) => `${localDayOf(Date.parse(iso), timeZone)} ${localClockOf(Date.parse(iso), timeZone)}`)}</li>)}
          </ul>
        ) : null}
        {signed && (!countersigned || countersignOutdated) && canSign ? (
          <Form method="post" className="mt-3 flex flex-wrap items-end gap-3 print:hidden" data-testid="countersign-request">
            <TextField className="min-w-64" label="Inspector's e-mail" name="email" type="email" required maxLength={254} error={errors.email} defaultValue={countersignOutdated ? countersigned?.email : undefined} hint={countersignPending ? `A link went to ${countersignPending.email}${countersignPending.mail === "pending" ? " (not sent yet)" : countersignPending.mail === "failed" ? " (the mail could not be sent)" : ""}; sending another replaces it.` : "The inspector gets a one-time link to read and countersign this report, no account needed."} />
            <SubmitButton intent="countersign-request" tone="plain" pendingLabel="Sending…">{countersignOutdated ? "Ask for a new countersignature" : "Send countersign link"}</SubmitButton>
          </Form>
        ) : null}
        {amendments.length > 0 ? (
          <ul className="mt-3 space-y-1 text-sm" data-testid="amendments">
            {amendments.map((amendment) => <li key={amendment.at + amendment.text}><span className="font-medium">Amendment</span> {local(amendment.at)} by {amendment.by}: {amendment.text}</li>)}
          </ul>
        ) : null}
        {signed && canSign ? (
          <Form method="post" className="mt-3 flex flex-wrap items-end gap-3 print:hidden">
            <TextField className="min-w-64 flex-1" label="Amendment" name="text" required maxLength={4000} error={errors.text} />
            <SubmitButton intent="amend" tone="plain" pendingLabel="Adding…">Add amendment</SubmitButton>
          </Form>
        ) : null}
      </Section>
    </div>
  );
}

type EquipmentDraft = { id: number; name: string; workingHours: string; idleHours: string; idleReason: string };

/**
 * The day's equipment lines, edited together: a line per piece (name, hours working, hours idle,
 * why it stood idle), added and removed with buttons; saving replaces the day's lines. Each line
 * keeps its number in the field names when one above it is removed, so an error stays on its field.
 */
function EquipmentForm({ saved, names, dayHours, errors }: { saved: ReadonlyArray<{ name: string; workingHours: number; idleHours: number; idleReason: string }>; names: readonly string[]; dayHours: number; errors: Record<string, string> }) {
  const [lines, setLines] = useState<EquipmentDraft[]>(() => {
    const start = saved.length > 0
      ? saved.map((line, id) => ({ id, name: line.name, workingHours: String(line.workingHours), idleHours: String(line.idleHours), idleReason: line.idleReason }))
      : names.map((name, id) => ({ id, name, workingHours: "", idleHours: "", idleReason: "" }));
    return start.length > 0 ? start : [{ id: 0, name: "", workingHours: "", idleHours: "", idleReason: "" }];
  });
  const nextId = () => Math.max(-1, ...lines.map((line) => line.id)) + 1;
  const lineErrors = Object.entries(errors).filter(([field]) => field.startsWith("equipment."));
  return (
    <Form method="post" className="mt-3 space-y-3 print:hidden" data-testid="equipment-form">
      <fieldset className="space-y-3">
        <legend className="text-sm font-medium">Equipment working and idle today</legend>
        <p className="text-sm text-muted">
          A line per piece of equipment (suction pump, booster pump, dewatering plant, work boat…): its hours working and idle, up to {dayHours} h together on this day, and why it stood idle.
          {names.length > 0 && saved.length === 0 ? " The names are those of the last report; fill in today's hours or remove a line." : ""}
        </p>
        {lineErrors.length > 0 ? <p role="alert" className="text-sm text-danger">{lineErrors.length === 1 ? "One line needs a correction" : `${lineErrors.length} corrections are needed`}: see the fields marked below.</p> : null}
        {lines.map((line, position) => {
          const name = (field: string) => `equipment.${line.id}.${field}`;
          const error = (field: string) => errors[name(field)];
          return (
            <div key={line.id} className="grid gap-2 rounded border border-line p-3 md:grid-cols-[minmax(0,2fr)_7rem_7rem_minmax(0,3fr)_auto] md:items-start" data-testid="equipment-line">
              <TextField label={`Line ${position + 1}: equipment`} name={name("name")} maxLength={120} defaultValue={line.name} placeholder="suction pump 1" error={error("name")} />
              <TextField label="Working (h)" name={name("workingHours")} type="number" inputMode="decimal" min={0} max={dayHours} step="any" defaultValue={line.workingHours} aria-invalid={error("workingHours") ? true : undefined} aria-describedby={error("workingHours") ? `${name("workingHours")}-error` : undefined} />
              <TextField label="Idle (h)" name={name("idleHours")} type="number" inputMode="decimal" min={0} max={dayHours} step="any" defaultValue={line.idleHours} aria-invalid={error("idleHours") ? true : undefined} aria-describedby={error("idleHours") ? `${name("idleHours")}-error` : undefined} />
              <TextField label="Idle reason" name={name("idleReason")} maxLength={500} defaultValue={line.idleReason} error={error("idleReason")} />
              <div className="md:pt-6">
                <button type="button" className="rounded border border-line px-3 py-2 text-sm" onClick={() => setLines((current) => current.filter((candidate) => candidate.id !== line.id))} aria-label={`Remove line ${position + 1}`}>
                  Remove
                </button>
              </div>
              {/* The hours' refusals are said below the line, full width: the narrow hour columns would wrap them into many lines. */}
              {(["workingHours", "idleHours"] as const).map((field) => (error(field) ? <p key={field} id={`${name(field)}-error`} className="text-sm text-danger md:col-span-5">{error(field)}</p> : null))}
            </div>
          );
        })}
        {lines.length < EQUIPMENT_MAX_LINES ? (
          <button type="button" className="rounded border border-line px-3 py-2 text-sm" onClick={() => setLines((current) => [...current, { id: nextId(), name: "", workingHours: "", idleHours: "", idleReason: "" }])}>
            Add a line
          </button>
        ) : null}
      </fieldset>
      <div><SubmitButton intent="equipment" tone="plain" pendingLabel="Saving…">Save equipment hours</SubmitButton></div>
    </Form>
  );
}
