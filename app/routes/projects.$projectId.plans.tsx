import { Form, Link, redirect } from "react-router";
import { z } from "zod";
import { DAY_PLAN_STATE_LABELS, type DayPlanState } from "../../shared/dive-plan/day-plan-state";
import { requireRole } from "~/lib/auth/access.server";
import { can } from "~/lib/auth/permissions";
import { workDateSchema } from "~/models/assignments.server";
import { listDayPlans } from "~/models/day-plans.server";
import type { Route } from "./+types/projects.$projectId.plans";

// The day plans, newest first, a page at a time; "open a date" jumps to any day's plan.

const querySchema = z.object({
  page: z.coerce.number().int().min(1).max(100_000).catch(1),
  date: workDateSchema.optional().catch(undefined),
});

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId);
  const { project } = access;
  const query = querySchema.parse(Object.fromEntries(new URL(request.url).searchParams));
  if (query.date) throw redirect(`/projects/${project.id}/plans/${query.date}`);
  return { projectId: project.id, timeZone: project.timeZone, canAssign: can(access, "plans.assign"), ...(await listDayPlans(project, query.page)) };
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Dive plans · Firmsand" }];
}

const STATE_CLASS: Record<DayPlanState, string> = {
  upcoming: "border-lagoon text-lagoon",
  today: "border-lagoon bg-lagoon text-white",
  "dives-logged": "border-ok text-ok",
  "no-dives-logged": "border-caution text-caution",
};

function StateBadge({ state }: { state: DayPlanState }) {
  return <span className={`whitespace-nowrap rounded border px-2 py-0.5 font-sans text-xs ${STATE_CLASS[state]}`}>{DAY_PLAN_STATE_LABELS[state]}</span>;
}

export default function DayPlans({ loaderData }: Route.ComponentProps) {
  const { plans, projectId, today, timeZone, page, pages, total } = loaderData;
  const base = `/projects/${projectId}/plans`;
  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 className="text-lg font-semibold">Dive plans</h2>
          <p className="text-sm text-muted">
            Every day with cells assigned, newest first. Today is <span className="figures">{today}</span> in {timeZone}; dives are logged on a plan from its day on.
          </p>
          <p className="text-sm"><Link to={`/projects/${projectId}/teams`} className="text-lagoon underline">Dive teams</Link>: crews, hoses, pumps and stations.</p>
        </div>
        <Form method="get" action={base} className="flex items-end gap-2 text-sm" aria-label="Open a day's plan">
          <label className="flex flex-col">Open the plan for
            <input type="date" name="date" required defaultValue={today} className="rounded border border-line bg-panel px-2 py-1" />
          </label>
          <button type="submit" className="rounded border border-line px-3 py-1">Open</button>
        </Form>
      </div>
      {total === 0 ? (
        <div className="rounded border border-line bg-panel p-4 text-sm" data-testid="plans-empty">
          <p className="font-medium">No day plans yet.</p>
          <p className="mt-1 text-muted">
            A plan is made on the map: choose cells, then assign them to a team for a date.{" "}
            {loaderData.canAssign ? <Link to={`/projects/${projectId}/map`} className="text-lagoon underline">Go to the map</Link> : null}
          </p>
        </div>
      ) : plans.length === 0 ? (
        <p className="text-sm text-muted">No plans on page {page}. <Link to={base} className="underline">Back to the newest plans</Link></p>
      ) : (
        <div className="overflow-x-auto rounded border border-line bg-panel">
          <table className="w-full border-collapse text-sm" aria-label="Day plans">
            <thead>
              <tr className="border-b border-line text-left">
                <th scope="col" className="px-2 py-2 font-sans sm:px-3">Date</th>
                <th scope="col" className="px-2 py-2 font-sans sm:px-3">Teams</th>
                <th scope="col" className="px-2 py-2 text-right font-sans sm:px-3">Cells</th>
                <th scope="col" className="px-2 py-2 text-right font-sans sm:px-3">Dives logged</th>
                <th scope="col" className="hidden px-3 py-2 font-sans sm:table-cell">State</th>
              </tr>
            </thead>
            <tbody>
              {plans.map((plan) => (
                <tr key={plan.date} className="border-b border-line last:border-b-0" data-testid="plan-row">
                  <td className="px-2 py-2 sm:px-3">
                    <Link to={`${base}/${plan.date}`} className="figures whitespace-nowrap text-lagoon underline">{plan.date}</Link>
                    {/* On a phone the state rides under the date rather than in a column off the screen. */}
                    <span className="mt-1 block sm:hidden"><StateBadge state={plan.state} /></span>
                  </td>
                  <td className="px-2 py-2 font-sans sm:px-3">{plan.teams.join(", ")}</td>
                  <td className="figures px-2 py-2 text-right sm:px-3">{plan.cells}</td>
                  <td className="figures px-2 py-2 text-right sm:px-3">{plan.dives}</td>
                  <td className="hidden px-3 py-2 sm:table-cell"><StateBadge state={plan.state} /></td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {pages > 1 ? (
        <nav aria-label="Plan pages" className="flex items-center gap-3 text-sm">
          {page > 1 ? <Link to={`${base}?page=${page - 1}`} className="rounded border border-line px-3 py-1">Newer</Link> : null}
          <span className="text-muted">Page <span className="figures">{page}</span> of <span className="figures">{pages}</span> · <span className="figures">{total}</span> plans</span>
          {page < pages ? <Link to={`${base}?page=${page + 1}`} className="rounded border border-line px-3 py-1">Older</Link> : null}
        </nav>
      ) : null}
    </div>
  );
}
