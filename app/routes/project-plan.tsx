import { Form, Link } from "react-router";
import { z } from "zod";
import { requireRole } from "~/lib/access.server";
import { clientAddress } from "~/lib/client-address.server";
import { emailDayPlan, getDayPlan, workDateSchema } from "~/models/assignments.server";
import type { Route } from "./+types/project-plan";

function parseDate(value: string | undefined): string {
  const parsed = workDateSchema.safeParse(value);
  if (!parsed.success) throw new Response("A plan date is written YYYY-MM-DD.", { status: 404 });
  return parsed.data;
}

export async function loader({ request, params }: Route.LoaderArgs) {
  const { user, project, role } = await requireRole(request, params.projectId);
  const date = parseDate(params.date);
  const plan = await getDayPlan(project, date);
  return { project: { id: project.id, name: project.name }, plan, canSend: role === "dive-supervisor" || role === "manager" || (role === null && user.isSiteAdmin) };
}

const actionSchema = z.object({ intent: z.literal("email") });

export async function action({ request, params }: Route.ActionArgs) {
  const { user, project } = await requireRole(request, params.projectId, "dive-supervisor", "manager");
  const date = parseDate(params.date);
  const form = actionSchema.safeParse(Object.fromEntries(await request.formData()));
  if (!form.success) return { sentTo: [] as string[], error: "Unknown request." };
  const planUrl = new URL(`/projects/${project.id}/plans/${date}`, request.url).href;
  const sentTo = await emailDayPlan(project, user, date, planUrl, clientAddress(request));
  return { sentTo, error: sentTo.length === 0 ? "Nobody to e-mail: no team has cells on this date, or the teams list no members." : null };
}

// Print: one page, the plan only (site header, project nav and buttons hidden).
const PRINT_CSS = `
@media print {
  @page { size: letter landscape; margin: 10mm; }
  body > header, nav[aria-label="Project"], .no-print { display: none !important; }
  body { background: #fff; font-size: 9pt; }
  .plan-sheet { max-width: none; }
  .plan-sheet table { page-break-inside: avoid; }
  .plan-sheet h2 { font-size: 12pt; }
}`;

function ndlText(cell: Route.ComponentProps["loaderData"]["plan"]["teams"][number]["cells"][number]): string {
  const info = cell.noDecompression;
  if (!info) return "depth unknown";
  if (info.lookup.kind === "unlimited") return `no limit listed (${info.lookup.tableDepthFsw} fsw row)`;
  if (info.lookup.kind === "beyond-table") return "deeper than the rows held";
  return `${info.lookup.limitMinutes} min (${info.lookup.tableDepthFsw} fsw row)`;
}

export default function ProjectPlan({ loaderData, actionData }: Route.ComponentProps) {
  const { plan, project } = loaderData;
  return (
    <article className="plan-sheet space-y-3" aria-labelledby="plan-title">
      <style>{PRINT_CSS}</style>
      <h2 id="plan-title" className="text-lg font-semibold">Dive plan · {plan.date} · {project.name}</h2>
      <p role="note" className="rounded border border-caution bg-[#fff7e8] p-2 text-sm text-caution" data-testid="plan-caution">
        <strong>Caution.</strong> {plan.caution} No-decompression figures: {plan.source}.
      </p>
      <div className="no-print flex flex-wrap gap-2">
        <Link to={`/projects/${project.id}/map`} className="rounded border border-line px-3 py-1">Back to the map</Link>
        <button type="button" onClick={() => window.print()} className="rounded border border-line px-3 py-1">Print</button>
        {loaderData.canSend && plan.teams.length > 0 ? (
          <Form method="post">
            <button type="submit" name="intent" value="email" className="rounded bg-lagoon px-3 py-1 text-white">E-mail to team</button>
          </Form>
        ) : null}
      </div>
      {actionData ? (
        <p role="status" className={`no-print text-sm ${actionData.error ? "text-danger" : "text-ok"}`}>
          {actionData.error ?? `Sent to ${actionData.sentTo.join(", ")}.`}
        </p>
      ) : null}
      {plan.teams.length === 0 ? <p className="text-muted">No cells are assigned on {plan.date}.</p> : null}
      {plan.teams.map(({ team, cells, remainingVolume }) => (
        <section key={team.id} aria-label={team.name} className="space-y-1">
          <h3 className="font-semibold">{team.name}{team.station ? ` · ${team.station}` : ""}</h3>
          <p className="text-sm">{team.members.map((member) => `${member.name} (${member.duty})`).join(", ") || "No members listed."}</p>
          {team.belowMinimum ? (
            <p className="text-sm font-semibold text-danger" data-testid="plan-team-flag">
              {team.name} lists {team.members.length} people, below the project's minimum team size of {plan.minTeamSize}.
            </p>
          ) : null}
          <table className="w-full border-collapse text-sm">
            <thead>
              <tr className="border-b border-line text-left">
                <th className="py-1 pr-2">Cell</th><th className="pr-2">Zone</th><th className="pr-2">Hose</th>
                <th className="pr-2">Working depth ({plan.lengthLabel})</th><th className="pr-2">No-decompression figure</th>
                <th className="pr-2">Bottom time</th><th className="pr-2">Remaining thickness ({plan.lengthLabel})</th>
                <th className="pr-2">Remaining ({plan.volumeLabel})</th><th>Notes</th>
              </tr>
            </thead>
            <tbody>
              {cells.map((cell) => (
                <tr key={cell.label} className="border-b border-line">
                  <td className="py-1 pr-2">{cell.label}</td>
                  <td className="pr-2">{cell.zone ?? "—"}</td>
                  <td className="pr-2">{cell.hose}</td>
                  <td className="pr-2">{cell.workingDepth?.toFixed(1) ?? "—"}</td>
                  <td className="pr-2">{ndlText(cell)}</td>
                  <td className={`pr-2 ${cell.noDecompression?.exceeds ? "font-semibold text-danger" : ""}`}>
                    {cell.plannedBottomMinutes === null ? "—" : `${cell.plannedBottomMinutes} min${cell.noDecompression?.exceeds ? " — exceeds the figure" : ""}`}
                  </td>
                  <td className="pr-2">{cell.remainingThickness?.toFixed(2) ?? "—"}</td>
                  <td className="pr-2">{cell.remainingVolume?.toFixed(1) ?? "—"}</td>
                  <td>{[cell.notes, cell.confirmedReason ? `Confirmed cell reopened: ${cell.confirmedReason}` : ""].filter(Boolean).join(" · ") || "—"}</td>
                </tr>
              ))}
            </tbody>
            <tfoot>
              <tr><td colSpan={7} className="py-1 pr-2 text-right">Remaining in {team.name}'s cells</td><td>{remainingVolume.toFixed(1)}</td><td /></tr>
            </tfoot>
          </table>
        </section>
      ))}
    </article>
  );
}
