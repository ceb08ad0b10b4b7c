import { Link } from "react-router";
import { requireRole } from "~/lib/auth/access.server";
import { listRecentDays } from "~/models/daily-reports.server";
import type { Route } from "./+types/projects.$projectId.days";

// The recent local days and the state of each one's report.

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId, "reports.read");
  return { projectId: project.id, timeZone: project.timeZone, days: await listRecentDays(project) };
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Daily reports · Firmsand" }];
}

const STATE_CLASS = { "no work": "text-muted", draft: "text-danger", signed: "text-ok", amended: "text-ok" } as const;

export default function Days({ loaderData }: Route.ComponentProps) {
  const { days, projectId, timeZone } = loaderData;
  return (
    <div className="space-y-4">
      <h2 className="text-lg font-semibold">Daily reports</h2>
      <p className="text-sm text-muted">The last {days.length} days in {timeZone}. A day with dives logged and no signature is a draft.</p>
      <ul className="divide-y divide-line rounded border border-line bg-panel">
        {days.map((day) => (
          <li key={day.date} className="flex flex-wrap items-center justify-between gap-2 px-3 py-2 text-sm" data-testid="day">
            <Link className="figures underline" to={`/projects/${projectId}/days/${day.date}`}>{day.date}</Link>
            <span><span className="figures">{day.dives}</span> dives · <span className={STATE_CLASS[day.state]}>{day.state}</span></span>
          </li>
        ))}
      </ul>
    </div>
  );
}
