import { Form, Link, data } from "react-router";
import { z } from "zod";
import { FIND_CATEGORY_LABELS, type FindCategory } from "../../shared/finds/finds";
import { localClockOf } from "../../shared/local-time";
import { LITRES_PER_US_GALLON, kilogramsTo, massUnitsFor, measureLabel, unitLabel, type LengthUnit } from "../../shared/units";
import { ActionMessages } from "~/components/form-message";
import { SubmitButton } from "~/components/submit-button";
import { TextField } from "~/components/text-field";
import { requireRole } from "~/lib/auth/access.server";
import { can } from "~/lib/auth/permissions";
import { ConflictError, DomainError, detailsOf } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { fieldErrorsFrom } from "~/lib/http/form";
import { readPageForm } from "~/lib/http/body.server";
import { addAmendment, amendmentInputSchema, dayParam, enteredNotesInputSchema, getDailyReport, saveEnteredNotes, signDailyReport, signInputSchema } from "~/models/daily-reports.server";
import type { Route } from "./+types/projects.$projectId.days.$date";

// A day's report on screen: what is missing first, then the compiled sections, the entered
// weather and notes (until signed), the typed-name signature and the amendments after it.

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId, "reports.read");
  const date = dayParam(params.date);
  const view = await getDailyReport(access.project, date);
  return { projectId: access.project.id, timeZone: access.project.timeZone, lengthUnit: access.project.lengthUnit, lengthLabel: unitLabel(access.project.lengthUnit), date, ...view, canSign: can(access, "reports.sign"), signerName: access.user.name };
}

const formSchema = z.discriminatedUnion("intent", [
  z.object({ intent: z.literal("notes") }).passthrough(),
  z.object({ intent: z.literal("sign"), name: z.string() }),
  z.object({ intent: z.literal("amend"), text: z.string() }),
]);

export async function action({ request, params }: Route.ActionArgs) {
  const { project, user } = await requireRole(request, params.projectId, "reports.sign");
  const date = dayParam(params.date);
  const form = formSchema.safeParse(Object.fromEntries(await readPageForm(request)));
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
    if (input.intent === "sign") {
      const parsed = signInputSchema.safeParse({ name: input.name });
      if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), (field) => field));
      await signDailyReport(project, user, date, parsed.data.name, clientAddress(request));
      return { errors: {}, notice: "Signed: the report is locked; corrections are amendments." };
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

function Section({ title, children }: { title: string; children: React.ReactNode }) {
  return (
    <section className="break-inside-avoid rounded border border-line bg-panel p-4 print:border-0 print:p-0">
      <h3 className="mb-2 font-semibold">{title}</h3>
      {children}
    </section>
  );
}

const fmt = (value: number, places = 1) => value.toLocaleString("en-US", { maximumFractionDigits: places });

/** The report stores SI figures; it shows them in the project's units (US gallons, short tons and pounds on a feet project). */
function unitsFor(lengthUnit: LengthUnit) {
  const { mass, bulkMass } = massUnitsFor(lengthUnit);
  const metric = lengthUnit === "m";
  return {
    slurry: (m3: number) => (metric ? `${fmt(m3)} m³` : `${fmt((m3 * 1000) / LITRES_PER_US_GALLON, 0)} gal`),
    bulk: (kg: number) => `${fmt(kilogramsTo(kg, bulkMass), 2)} ${measureLabel(bulkMass)}`,
    mass: (kg: number) => `${fmt(kilogramsTo(kg, mass), metric ? 2 : 1)} ${measureLabel(mass)}`,
  };
}

export default function DailyReportPage({ loaderData, actionData }: Route.ComponentProps) {
  const { report, signed, amendments, canSign, projectId, date, timeZone } = loaderData;
  const units = unitsFor(loaderData.lengthUnit);
  const errors: Record<string, string> = actionData?.errors ?? {};
  const clock = (iso: string) => localClockOf(Date.parse(iso), timeZone);
  const weather = report.entered.weather;
  return (
    <div className="space-y-4">
      <ActionMessages error={errors.form} notice={actionData?.notice} />
      <div className="flex flex-wrap items-baseline justify-between gap-3">
        <h2 className="text-lg font-semibold">Daily report · <span className="figures">{date}</span></h2>
        <p className="text-sm print:hidden">
          <Link className="underline" to={`/projects/${projectId}/days`}>All days</Link> · <button type="button" className="underline" onClick={() => window.print()}>Print</button>
        </p>
      </div>
      <p className="text-sm text-muted">Local day in {timeZone}. {signed ? <>Figures as signed by <strong>{signed.name}</strong> at <span className="figures">{signed.at}</span>.</> : "Draft: figures compiled from the records as they stand now."}</p>

      {report.missing.length > 0 ? (
        <div role="status" className="rounded border border-danger bg-panel p-3 text-sm" data-testid="missing">
          <p className="font-medium text-danger">Missing</p>
          <ul className="list-disc pl-5">{report.missing.map((item) => <li key={item}>{item}</li>)}</ul>
        </div>
      ) : null}

      <Section title="Weather and notes">
        {weather ? (
          <p className="text-sm">{[weather.conditions, weather.airTemperature, weather.wind && `wind ${weather.wind}`, weather.rain && `rain ${weather.rain}`].filter(Boolean).join(" · ")}{weather.effect ? <> — effect on the work: {weather.effect}</> : null}</p>
        ) : <p className="text-sm text-muted">No weather entered.</p>}
        {report.entered.inspections ? <p className="mt-1 text-sm"><span className="font-medium">Inspections and visitors:</span> {report.entered.inspections}</p> : null}
        {report.entered.safety ? <p className="mt-1 text-sm"><span className="font-medium">Safety:</span> {report.entered.safety}</p> : null}
        {report.entered.notes ? <p className="mt-1 text-sm"><span className="font-medium">Notes:</span> {report.entered.notes}</p> : null}
        <p className="mt-1 text-xs text-muted">Incidents are reported as the project's safety plan directs; this report records them, it does not replace that reporting.</p>
        {canSign && !signed ? (
          <Form method="post" className="mt-3 grid gap-3 md:grid-cols-2 print:hidden" data-testid="notes-form">
            <TextField label="Conditions" name="conditions" maxLength={200} defaultValue={weather?.conditions ?? ""} error={errors.conditions} />
            <TextField label="Air temperature" name="airTemperature" maxLength={60} defaultValue={weather?.airTemperature ?? ""} error={errors.airTemperature} />
            <TextField label="Wind" name="wind" maxLength={120} defaultValue={weather?.wind ?? ""} error={errors.wind} />
            <TextField label="Rain" name="rain" maxLength={120} defaultValue={weather?.rain ?? ""} error={errors.rain} />
            <TextField className="md:col-span-2" label="Effect on the work" name="effect" maxLength={2000} defaultValue={weather?.effect ?? ""} error={errors.effect} />
            <TextField className="md:col-span-2" label="Inspections and visitors" name="inspections" maxLength={4000} defaultValue={report.entered.inspections} error={errors.inspections} />
            <TextField className="md:col-span-2" label="Safety (toolbox talk, incidents)" name="safety" maxLength={4000} defaultValue={report.entered.safety} error={errors.safety} />
            <TextField className="md:col-span-2" label="Other notes" name="notes" maxLength={4000} defaultValue={report.entered.notes} error={errors.notes} />
            <div><SubmitButton intent="notes" tone="plain" pendingLabel="Saving…">Save weather and notes</SubmitButton></div>
          </Form>
        ) : null}
      </Section>

      <Section title="Dive work">
        <p className="text-sm"><span className="figures">{report.dives.count}</span> dives · <span className="figures">{report.dives.bottomMinutes}</span> bottom minutes · deepest <span className="figures whitespace-nowrap">{report.dives.maxDepth === null ? "—" : `${report.dives.maxDepth} ${loaderData.lengthLabel}`}</span></p>
        {report.teams.length > 0 ? (
          <div className="mt-2 overflow-x-auto">
            <table className="w-full text-sm">
              <thead><tr className="text-left align-bottom text-muted"><th scope="col" className="pr-3">Team</th><th scope="col" className="pr-3">Head count</th><th scope="col" className="pr-3">Dives</th><th scope="col" className="pr-3">Bottom time (min)</th><th scope="col" className="pr-3">Max depth ({loaderData.lengthLabel})</th><th scope="col">Cells</th></tr></thead>
              <tbody>
                {report.teams.map((team) => (
                  <tr key={team.team} className="border-t border-line"><td className="pr-3">{team.team}</td><td className="figures pr-3">{team.headCount ?? "—"}</td><td className="figures pr-3">{team.dives}</td><td className="figures pr-3">{team.bottomMinutes}</td><td className="figures pr-3">{team.maxDepth ?? "—"}</td><td className="figures break-words">{team.cells.join(" ")}</td></tr>
                ))}
              </tbody>
            </table>
          </div>
        ) : null}
        {report.teams.some((team) => (team.visitors ?? []).length > 0) ? (
          <p className="mt-2 text-sm" data-testid="report-visitors">
            Visitors diving (not on the team's roster): {report.teams.filter((team) => (team.visitors ?? []).length > 0).map((team) => `${team.team}: ${team.visitors!.join(", ")}`).join("; ")}.
          </p>
        ) : null}
        {report.dives.flags.length > 0 ? <ul className="mt-2 list-disc pl-5 text-sm text-danger">{report.dives.flags.map((flag) => <li key={flag}>{flag}</li>)}</ul> : null}
        {report.dives.flags.length > 0 ? <p className="text-xs text-muted">Flags are information from the published table, never approval; the dive safety plan governs.</p> : null}
      </Section>

      <Section title="Production">
        <dl className="grid grid-cols-2 gap-x-4 gap-y-1 text-sm md:grid-cols-4">
          <dt className="text-muted">Shifts</dt><dd className="figures">{report.production.shifts}</dd>
          <dt className="text-muted">Pump hours</dt><dd className="figures">{fmt(report.production.pumpHours, 2)}</dd>
          <dt className="text-muted">Slurry pumped</dt><dd className="figures">{units.slurry(report.production.slurryPumpedM3)}</dd>
          <dt className="text-muted">Dry solids pumped</dt><dd className="figures">{units.bulk(report.production.drySolidsKg)}</dd>
          <dt className="text-muted">Neat polymer</dt><dd className="figures">{units.mass(report.production.neatPolymerKg)}</dd>
          <dt className="text-muted">Tube fills</dt><dd className="figures">{report.production.tubeFills}</dd>
          <dt className="text-muted">Haul loads</dt><dd className="figures">{report.production.haulLoads}</dd>
          <dt className="text-muted">Dry solids hauled</dt><dd className="figures">{units.bulk(report.production.haulDrySolidsKg)}</dd>
        </dl>
        {report.production.haulTickets.length > 0 ? <p className="mt-1 text-xs text-muted">Tickets: <span className="figures">{report.production.haulTickets.join(", ")}</span></p> : null}
        {report.production.survey ? (
          <p className="mt-2 text-sm" data-testid="day-survey">
            Survey of this day{report.production.survey.since ? <> against the survey of <span className="figures whitespace-nowrap">{report.production.survey.since}</span></> : null}:{" "}
            <span className="figures">{fmt(report.production.survey.removedVolume)} {report.production.survey.volumeLabel}</span> removed,{" "}
            <span className="figures">{report.production.survey.cellsReachedFirmSand}</span> {Math.abs(report.production.survey.cellsReachedFirmSand) === 1 ? "cell" : "cells"} newly at firm sand,{" "}
            <span className="figures">{fmt(report.production.survey.remainingVolume)} {report.production.survey.volumeLabel}</span> remaining.
          </p>
        ) : null}
      </Section>

      <Section title="Water quality">
        {report.waterQuality.readings.length === 0 ? <p className="text-sm text-muted">No stations and no readings.</p> : (
          <ul className="space-y-1 text-sm">
            {report.waterQuality.readings.map((row) => (
              <li key={row.station}>
                <span className="font-medium">{row.station}</span> <span className="text-muted">({row.stationKind})</span>: <span className="figures">{row.count}</span> readings
                {row.count > 0 ? <>, highest <span className="figures">{row.maxValue}</span> {row.unit} · <span className={row.verdict === "exceeds" ? "text-danger" : ""}>{row.verdict}</span></> : null}
              </li>
            ))}
          </ul>
        )}
        {report.waterQuality.exceedances.map((row) => <p key={row.at + row.station} className="text-sm text-danger">Exceedance at {row.station}, {clock(row.at)}: <span className="figures">{row.value}</span> {row.unit}</p>)}
        {report.waterQuality.missedIntervals.map((gap) => <p key={gap.from} className="text-sm text-danger">Not sampled {clock(gap.from)}–{clock(gap.to)}</p>)}
        <p className="mt-1 text-xs text-muted">Readings support the permit's monitoring; the permit and the agency decide compliance.</p>
      </Section>

      <Section title="Interruptions">
        {report.interruptions.length === 0 ? <p className="text-sm text-muted">None recorded.</p> : (
          <ul className="space-y-1 text-sm">
            {report.interruptions.map((event) => (
              <li key={event.kind + event.start}>{event.kind === "stop-work" ? "Stop-work" : "Wildlife stand-down"} ({event.reason}) from {clock(event.start)} to {event.end ? clock(event.end) : "still open"}: <span className="figures">{fmt(event.lostHours, 2)}</span> h lost on the day</li>
            ))}
          </ul>
        )}
        <p className="mt-1 text-sm">Lost in all: <span className="figures">{fmt(report.lostHours, 2)}</span> h</p>
      </Section>

      <Section title="Finds">
        {Object.keys(report.finds.byCategory).length === 0 ? <p className="text-sm text-muted">No finds.</p> : (
          <p className="text-sm">{Object.entries(report.finds.byCategory).map(([category, count]) => `${FIND_CATEGORY_LABELS[category as FindCategory] ?? category}: ${count}`).join(" · ")}</p>
        )}
        {report.finds.catalogueNumbers.length > 0 ? <p className="figures text-xs">{report.finds.catalogueNumbers.join(", ")}</p> : null}
        {report.holds.placed.length > 0 ? <p className="text-sm">Holds placed: <span className="figures">{report.holds.placed.join(", ")}</span></p> : null}
        {report.holds.lifted.length > 0 ? <p className="text-sm">Holds lifted: <span className="figures">{report.holds.lifted.join(", ")}</span></p> : null}
        <p className="mt-1 text-xs text-muted">No find locations appear in this report.</p>
      </Section>

      <Section title="Sign-off">
        {signed ? (
          <p className="text-sm" data-testid="signed">Signed by <strong>{signed.name}</strong> at <span className="figures">{signed.at}</span>. Locked.</p>
        ) : canSign ? (
          <Form method="post" className="flex flex-wrap items-end gap-3 print:hidden">
            <TextField label="Your name (typed, as your signature)" name="name" required maxLength={200} defaultValue={loaderData.signerName} error={errors.name} />
            <SubmitButton intent="sign" pendingLabel="Signing…">Sign the report</SubmitButton>
          </Form>
        ) : <p className="text-sm text-muted">Not signed yet.</p>}
        {amendments.length > 0 ? (
          <ul className="mt-3 space-y-1 text-sm" data-testid="amendments">
            {amendments.map((amendment) => <li key={amendment.at + amendment.text}><span className="font-medium">Amendment</span> <span className="figures">{amendment.at}</span> by {amendment.by}: {amendment.text}</li>)}
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
