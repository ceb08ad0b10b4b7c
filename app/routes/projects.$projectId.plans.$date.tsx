import { useEffect, useRef, useState } from "react";
import { Form, Link, data, useNavigation } from "react-router";
import { z } from "zod";
import { can } from "~/lib/auth/permissions";
import { requireAllowed, requireRole } from "~/lib/auth/access.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { appOrigin } from "~/lib/http/origin.server";
import { DomainError } from "~/lib/errors";
import { emailDayPlan, getDayPlan, workDateSchema } from "~/models/assignments.server";
import { diveInputSchema, listDivesOn, recordDive, type DiveView } from "~/models/dives.server";
import { getDaySheetExtras } from "~/models/day-plans.server";
import { DaySheetMap, EmergencyBlock, SignOffLines, signingDivers } from "~/components/day-sheet";
import { describeNamed, equipmentLine } from "../../shared/dive-plan/equipment";
import type { Route } from "./+types/projects.$projectId.plans.$date";
import { readPageForm } from "~/lib/http/body.server";

function parseDate(value: string | undefined): string {
  const parsed = workDateSchema.safeParse(value);
  if (!parsed.success) throw new Response("A plan date is written YYYY-MM-DD.", { status: 404 });
  return parsed.data;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId);
  const { project } = access;
  const date = parseDate(params.date);
  const [plan, dives] = await Promise.all([getDayPlan(project, date), listDivesOn(project, date)]);
  const sheet = await getDaySheetExtras(project, plan);
  return {
    project: { id: project.id, name: project.name },
    plan, dives, sheet,
    canSend: can(access, "plans.assign"),
    canLogDives: can(access, "dives.log"),
    canLogFinds: can(access, "finds.log"),
    canConfigure: can(access, "project.configure"),
  };
}

const actionSchema = z.object({ intent: z.enum(["email", "dive"]) });

type ActionResult =
  | { intent: "email"; sentTo: string[]; error: string | null }
  | { intent: "dive"; teamId: number; ok: boolean; message: string; field?: string };

const optionalText = (value: FormDataEntryValue | null) => (typeof value === "string" && value.trim() !== "" ? value.trim() : null);
const optionalNumber = (value: FormDataEntryValue | null) => (optionalText(value) === null ? null : Number(optionalText(value)));

// A refused request answers 400 with what to fix; the page shows it beside the form it came from.
const refused = (result: ActionResult, status = 400) => data(result, { status });

/** The form's diver select: a roster name, or this value for a visitor (whose name is typed beside it). */
const VISITOR = "(visitor)";

export async function action({ request, params }: Route.ActionArgs) {
  const access = await requireRole(request, params.projectId, "plans.assign");
  const { user, project } = access;
  const date = parseDate(params.date);
  const formData = await readPageForm(request);
  const form = actionSchema.safeParse({ intent: formData.get("intent") });
  if (!form.success) return refused({ intent: "email", sentTo: [], error: "Unknown request." });
  requireAllowed(access, form.data.intent === "dive" ? "dives.log" : "plans.assign");
  if (form.data.intent === "dive") {
    const teamId = Number(formData.get("team"));
    const visitor = formData.get("diver") === VISITOR;
    const input = diveInputSchema.safeParse({
      date,
      team: teamId,
      diver: (visitor ? formData.get("visitorName") : formData.get("diver")) ?? "",
      visitor,
      leftSurface: optionalText(formData.get("leftSurface")),
      leftBottom: optionalText(formData.get("leftBottom")),
      bottomMinutes: optionalNumber(formData.get("bottomMinutes")),
      maxDepth: optionalNumber(formData.get("maxDepth")) ?? Number.NaN,
      cells: formData.getAll("cells").filter((value): value is string => typeof value === "string"),
      notes: optionalText(formData.get("notes")) ?? "",
    });
    if (!input.success) {
      const names: Record<string, string> = { diver: visitor ? "Visitor's name" : "Diver", leftSurface: "Left surface", leftBottom: "Left bottom", bottomMinutes: "Bottom time", maxDepth: "Maximum depth", cells: "Cells worked", notes: "Notes", team: "Team" };
      return refused({ intent: "dive", teamId, ok: false, message: input.error.issues.map((issue) => `${names[String(issue.path[0])] ?? "Dive"}: ${issue.message}`).join("; ") + "." });
    }
    try {
      const { dive } = await recordDive(project, user, input.data, clientAddress(request));
      return { intent: "dive", teamId, ok: true, message: `Logged ${dive.diver}${dive.visitor ? " (visitor)" : ""}'s dive: ${dive.bottomMinutes} min bottom time, ${dive.maxDepth} maximum depth, cells ${dive.cells.join(", ")}.` } satisfies ActionResult;
    } catch (error) {
      if (error instanceof DomainError) {
        const field = error.details[0]?.field;
        // A dive dated after today is refused as the API refuses it (422), naming the date.
        if (field === "date") return refused({ intent: "dive", teamId, ok: false, field, message: `Date: ${error.message}` }, 422);
        return refused({ intent: "dive", teamId, ok: false, field, message: error.message });
      }
      throw error;
    }
  }
  const planUrl = new URL(`/projects/${project.id}/plans/${date}`, appOrigin()).href;
  const sentTo = await emailDayPlan(project, user, date, planUrl, clientAddress(request));
  return { intent: "email", sentTo, error: sentTo.length === 0 ? "Nobody to e-mail: no team has cells on this date, or the teams list no members." : null } satisfies ActionResult;
}

// Print: the day sheet (site header, project nav, buttons and forms hidden; sign-off lines shown).
const PRINT_CSS = `
.print-only { display: none; }
@media print {
  @page { size: letter landscape; margin: 10mm; }
  body > header, nav[aria-label="Project"], .no-print, [data-testid="stop-work-banner"] { display: none !important; }
  .print-only { display: block !important; }
  body { background: #fff; font-size: 9pt; min-height: 0 !important; }
  main, .plan-sheet { max-width: none !important; }
  .plan-sheet table, .plan-sheet figure, .emergency-block, .sign-off { page-break-inside: avoid; break-inside: avoid; }
  h1:has(+ nav[aria-label="Project"]) { display: none !important; }
  .plan-sheet :not(svg, svg *) { font-size: 8pt !important; line-height: 1.3 !important; }
  .plan-sheet h2#plan-title { font-size: 11pt !important; }
  .plan-sheet h3 { font-size: 9pt !important; }
  .plan-sheet > * + * { margin-top: 2mm !important; }
  .day-sheet-top > * + * { margin-top: 2mm !important; }
  div:has(> .plan-sheet) { margin-top: 0 !important; }
  div:has(> div > .plan-sheet) { padding-top: 0 !important; padding-bottom: 0 !important; }
  .day-sheet-map svg { max-height: 46mm; width: auto; max-width: 100%; }
  .sign-off tbody tr { height: 6mm; }
  .plan-sheet section > * + * { margin-top: 1mm !important; }
  [data-testid="plan-caution"] { padding: 1.5mm 2mm; }
}
@media print and (min-width: 600px) {
  .day-sheet-top { display: grid !important; grid-template-columns: 1fr 1fr; gap: 4mm; align-items: start; }
  .day-sheet-top > * + * { margin-top: 0 !important; }
}`;

function ndlText(cell: Route.ComponentProps["loaderData"]["plan"]["teams"][number]["cells"][number]): string {
  const info = cell.noDecompression;
  if (!info) return "depth unknown";
  if (info.lookup.kind === "unlimited") return `no limit listed (${info.lookup.tableDepthFsw} fsw row)`;
  if (info.lookup.kind === "beyond-table") return "deeper than the rows held";
  return `${info.lookup.limitMinutes} min (${info.lookup.tableDepthFsw} fsw row)`;
}

export default function ProjectPlan({ loaderData, actionData }: Route.ComponentProps) {
  const { plan, project, sheet } = loaderData;
  const upcoming = plan.date > sheet.today;
  return (
    <article className="plan-sheet space-y-3" aria-labelledby="plan-title">
      <style>{PRINT_CSS}</style>
      <h2 id="plan-title" className="text-lg font-semibold">Dive plan · {plan.date} · {project.name}</h2>
      <p role="note" className="rounded border border-caution bg-[#fff7e8] p-2 text-sm text-caution" data-testid="plan-caution">
        <strong>Caution.</strong> {plan.caution} No-decompression figures: {plan.source}.
      </p>
      <div className="no-print flex flex-wrap gap-2">
        <Link to={`/projects/${project.id}/plans`} className="rounded border border-line px-3 py-1">All plans</Link>
        <Link to={`/projects/${project.id}/map`} className="rounded border border-line px-3 py-1">Back to the map</Link>
        <button type="button" onClick={() => window.print()} className="rounded border border-line px-3 py-1">Print day sheet</button>
        {loaderData.canSend && plan.teams.length > 0 ? (
          <Form method="post">
            <button type="submit" name="intent" value="email" className="rounded bg-lagoon px-3 py-1 text-white">E-mail to team</button>
          </Form>
        ) : null}
      </div>
      {actionData?.intent === "email" ? (
        <p role="status" className={`no-print text-sm ${actionData.error ? "text-danger" : "text-ok"}`}>
          {actionData.error ?? `Sent to ${actionData.sentTo.join(", ")}.`}
        </p>
      ) : null}
      <div className="day-sheet-top space-y-3">
        <EmergencyBlock info={sheet.emergency} missing={sheet.emergencyMissing} settingsHref={loaderData.canConfigure ? `/projects/${project.id}/settings#emergency-heading` : null} />
        {sheet.map && plan.teams.length > 0 ? <DaySheetMap map={sheet.map} date={plan.date} lengthLabel={plan.lengthLabel} /> : null}
      </div>
      {plan.teams.length === 0 ? <p className="text-muted">No cells are assigned on {plan.date}.</p> : null}
      {plan.teams.map(({ team, cells, remainingVolume }) => {
        const teamDives = loaderData.dives.filter((dive) => dive.team === team.name);
        return (
          <section key={team.id} aria-label={team.name} className="space-y-1">
            <h3 className="font-semibold">{team.name}{team.station ? ` · ${team.station}` : ""}</h3>
            <p className="text-sm">{team.members.map((member) => (member.duty ? `${member.name} (${member.duty})` : member.name)).join(", ") || "No members listed."}</p>
            <p className="text-sm" data-testid="plan-team-equipment">{equipmentLine(team.hoses, team.pumps)}</p>
            {team.belowMinimum ? (
              <p className="text-sm font-semibold text-danger" data-testid="plan-team-flag">
                {team.name} lists {team.members.length} people, below the project's minimum team size of {plan.minTeamSize}.
              </p>
            ) : null}
            <div className="overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label={`Cells for ${team.name}, scrollable`}>
              <table className="w-full border-collapse text-sm">
                <thead>
                  <tr className="border-b border-line text-left">
                    <th className="py-1 pr-2">Cell</th><th className="pr-2">Zone</th><th className="pr-2">Hose</th>
                    <th className="pr-2 text-right">Working depth ({plan.lengthLabel})</th><th className="pr-2">No-decompression figure</th>
                    <th className="pr-2 text-right">Bottom time</th><th className="pr-2 text-right">Remaining thickness ({plan.lengthLabel})</th>
                    <th className="pr-2 text-right">Remaining ({plan.volumeLabel})</th><th>Notes</th>
                  </tr>
                </thead>
                <tbody>
                  {cells.map((cell) => (
                    <tr key={cell.label} className="border-b border-line">
                      <td className="figures py-1 pr-2">{cell.label}</td>
                      <td className="pr-2">{cell.zone ?? "—"}</td>
                      <td className="pr-2">{describeNamed(team.hoses, cell.hose)}</td>
                      <td className="figures pr-2 text-right">{cell.workingDepth?.toFixed(1) ?? "—"}</td>
                      <td className="pr-2">{ndlText(cell)}</td>
                      <td className={`figures pr-2 text-right ${cell.noDecompression?.exceeds ? "font-semibold text-danger" : ""}`}>
                        {cell.plannedBottomMinutes === null ? "—" : `${cell.plannedBottomMinutes} min${cell.noDecompression?.exceeds ? " — exceeds the figure" : ""}`}
                      </td>
                      <td className="figures pr-2 text-right">{cell.remainingThickness?.toFixed(2) ?? "—"}</td>
                      <td className="figures pr-2 text-right">{cell.remainingVolume?.toFixed(1) ?? "—"}</td>
                      <td>{[cell.notes, cell.confirmedReason ? `Confirmed cell reopened: ${cell.confirmedReason}` : ""].filter(Boolean).join(" · ") || "—"}</td>
                    </tr>
                  ))}
                </tbody>
                <tfoot>
                  <tr><td colSpan={7} className="py-1 pr-2 text-right">Remaining in {team.name}'s cells</td><td className="figures pr-2 text-right">{remainingVolume.toFixed(1)}</td><td /></tr>
                </tfoot>
              </table>
            </div>
            <DiveLog teamName={team.name} dives={teamDives} lengthLabel={plan.lengthLabel} findsHref={loaderData.canLogFinds ? `/projects/${project.id}/finds/new` : null} />
            {loaderData.canLogFinds ? (
              <p className="no-print text-sm">
                <Link to={`/projects/${project.id}/finds/new?team=${team.id}&cells=${encodeURIComponent(cells.map((cell) => cell.label).join(","))}`} className="text-lagoon underline">
                  Log a find from {team.name}'s cells
                </Link>
                {" · "}
                <Link to={`/projects/${project.id}/finds/basket?team=${team.id}&cells=${encodeURIComponent(cells.map((cell) => cell.label).join(","))}`} className="text-lagoon underline">
                  a basket load
                </Link>
              </p>
            ) : null}
            {loaderData.canLogDives && upcoming ? (
              <p className="no-print text-sm text-muted" data-testid="dive-log-upcoming">
                Dives are logged once made: this plan is for {plan.date}, after today ({sheet.today} in {sheet.timeZone}). The form opens on the day.
              </p>
            ) : null}
            {loaderData.canLogDives && !upcoming ? (
              <DiveForm
                teamId={team.id} teamName={team.name} members={team.members} cells={cells.map((cell) => cell.label)} lengthLabel={plan.lengthLabel}
                result={actionData?.intent === "dive" && actionData.teamId === team.id ? actionData : null}
              />
            ) : null}
            <div className="print-only pt-2">
              <SignOffLines teamName={team.name} divers={signingDivers(team.members, teamDives.filter((dive) => dive.visitor).map((dive) => dive.diver))} />
            </div>
          </section>
        );
      })}
    </article>
  );
}

/** Table figure and flag for a logged dive (information only, as on the plan). */
function diveFigure(dive: DiveView): { text: string; beyond: boolean } {
  const info = dive.noDecompression;
  if (!info) return { text: "—", beyond: false };
  const { lookup } = info;
  if (lookup.kind === "unlimited") return { text: `no limit listed (${lookup.tableDepthFsw} fsw row)`, beyond: false };
  if (lookup.kind === "beyond-table") return { text: "deeper than the rows held", beyond: true };
  return { text: `${lookup.limitMinutes} min (${lookup.tableDepthFsw} fsw row)`, beyond: info.exceeds === true };
}

function DiveLog({ teamName, dives, lengthLabel, findsHref }: { teamName: string; dives: DiveView[]; lengthLabel: string; findsHref: string | null }) {
  if (dives.length === 0) return <p className="text-sm text-muted">No dives logged for {teamName} on this date.</p>;
  return (
    <div className="overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label={`Dives logged for ${teamName}, scrollable`}>
    <table className="w-full border-collapse text-sm" aria-label={`Dives logged for ${teamName}`}>
      <thead>
        <tr className="border-b border-line text-left">
          <th className="py-1 pr-2">Diver</th><th className="pr-2">Left surface</th><th className="pr-2">Left bottom</th><th className="pr-2 text-right">Bottom time</th>
          <th className="pr-2 text-right">Max depth ({lengthLabel})</th><th className="pr-2">No-decompression figure</th><th className="pr-2">Cells</th><th>Notes</th>{findsHref ? <th className="no-print pl-2"><span className="sr-only">Finds</span></th> : null}
        </tr>
      </thead>
      <tbody>
        {dives.map((dive) => {
          const figure = diveFigure(dive);
          return (
            <tr key={dive.id} className="border-b border-line">
              <td className="py-1 pr-2">{dive.diver}{dive.visitor ? <span className="ml-1 rounded border border-caution px-1 text-xs text-caution" data-testid="dive-visitor">visitor</span> : null}</td>
              <td className="figures pr-2">{dive.leftSurface ?? "—"}</td>
              <td className="figures pr-2">{dive.leftBottom ?? "—"}</td>
              <td className={`figures pr-2 text-right ${figure.beyond ? "font-semibold text-danger" : ""}`} data-testid={figure.beyond ? "dive-flag" : undefined}>
                {dive.bottomMinutes} min{figure.beyond ? " — beyond the table's figure (information only: the dive plan, safety manual and diving standard decide)" : ""}
              </td>
              <td className="figures pr-2 text-right">{dive.maxDepth.toFixed(1)}</td>
              <td className="pr-2">{figure.text}</td>
              <td className="figures pr-2">{dive.cells.join(", ")}</td>
              <td>{dive.notes || "—"}</td>
              {findsHref ? (
                <td className="no-print pl-2">
                  <Link to={`${findsHref}?dive=${dive.id}`} className="whitespace-nowrap text-lagoon underline" aria-label={`Log a find from ${dive.diver}'s dive at ${dive.leftSurface ?? "?"}`}>Log a find</Link>
                </td>
              ) : null}
            </tr>
          );
        })}
      </tbody>
    </table>
    </div>
  );
}

function DiveForm({ teamId, teamName, members, cells, lengthLabel, result }: { teamId: number; teamName: string; members: Array<{ name: string; duty: string }>; cells: string[]; lengthLabel: string; result: { ok: boolean; message: string; field?: string } | null }) {
  const navigation = useNavigation();
  const formRef = useRef<HTMLFormElement>(null);
  const [diver, setDiver] = useState("");
  useEffect(() => {
    if (result?.ok) {
      formRef.current?.reset();
      setDiver("");
    }
  }, [result]);
  const diverId = `diver-${teamId}`;
  const visitorId = `visitor-${teamId}`;
  const field = "rounded border border-line px-2 py-1";
  return (
    <Form ref={formRef} method="post" aria-label={`Log a dive for ${teamName}`} className="no-print space-y-2 rounded border border-line p-2 text-sm">
      <h4 className="font-semibold">Log a dive for {teamName}</h4>
      <input type="hidden" name="team" value={teamId} />
      <div className="flex flex-wrap gap-3">
        <span className="flex items-center gap-1">
          <label htmlFor={diverId}>Diver</label>
          <select id={diverId} name="diver" required value={diver} onChange={(event) => setDiver(event.target.value)} className={field} aria-invalid={result?.field === "diver" ? true : undefined}>
            <option value="" disabled>Choose from {teamName}</option>
            {members.map((member) => <option key={member.name} value={member.name}>{member.duty ? `${member.name} (${member.duty})` : member.name}</option>)}
            <option value={VISITOR}>Visitor, not on the roster…</option>
          </select>
        </span>
        {diver === VISITOR ? (
          <span className="flex items-center gap-1">
            <label htmlFor={visitorId}>Visitor's name</label>
            <input id={visitorId} name="visitorName" required maxLength={120} autoFocus className={field} aria-invalid={result?.field === "diver" ? true : undefined} />
          </span>
        ) : null}
        <label>Left surface <input name="leftSurface" type="time" className={field} /></label>
        <label>Left bottom <input name="leftBottom" type="time" className={field} /></label>
        <label>or bottom time (min) <input name="bottomMinutes" type="number" min={1} max={600} step={1} className={`${field} w-20`} /></label>
        <label>Maximum depth ({lengthLabel}) <input name="maxDepth" type="number" min={0.1} max={400} step={0.1} required className={`${field} w-24`} /></label>
      </div>
      <fieldset className="flex flex-wrap gap-2">
        <legend>Cells worked</legend>
        {cells.map((label) => (
          <label key={label} className="flex items-center gap-1"><input type="checkbox" name="cells" value={label} />{label}</label>
        ))}
      </fieldset>
      <label className="block">Notes <textarea name="notes" rows={2} maxLength={4000} className={`${field} block w-full`} /></label>
      <p className="text-xs text-muted">
        A visitor is a diver not on {teamName}'s roster (another crew's diver, an inspector); the log and the daily report mark them. Bottom time runs from leaving the surface to leaving the bottom. A bottom time beyond the table's no-decompression figure for the maximum depth is flagged as information only; the dive supervisor's dive plan, the project's safety manual and the governing diving standard decide.
      </p>
      <button type="submit" name="intent" value="dive" disabled={navigation.state === "submitting"} className="rounded bg-lagoon px-3 py-1 text-white disabled:opacity-60">Log dive</button>
      {result ? <p role={result.ok ? "status" : "alert"} className={result.ok ? "text-ok" : "text-danger"} data-testid="dive-result">{result.message}</p> : null}
    </Form>
  );
}
