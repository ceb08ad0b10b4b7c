import { NavLink, Outlet, useMatches } from "react-router";
import { can } from "~/lib/auth/permissions";
import { requireRole } from "~/lib/auth/access.server";
import { ROLE_LABELS } from "~/lib/auth/roles";
import { StopWorkBanner } from "~/components/stop-work-banner";
import { currentStoppages } from "~/models/stoppages.server";
import { heldCellLabels } from "~/models/holds.server";
import type { Route } from "./+types/projects.$projectId";

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId);
  const { project, role } = access;
  const canReadFinds = can(access, "finds.read");
  return {
    project: { id: project.id, name: project.name },
    roleLabel: role ? ROLE_LABELS[role] : "Site administrator",
    canManageMembers: can(access, "members.manage"),
    canReadAudit: can(access, "audit.read"),
    canConfigure: can(access, "project.configure"),
    canReadReports: can(access, "reports.read"),
    // Open stop-work events and stand-downs show on every project page.
    stoppages: await currentStoppages(project),
    canReadFinds,
    // Open stop-work events show on every project page (cells only: never the find).
    heldCellCount: canReadFinds ? (await heldCellLabels(project.id)).length : 0,
  };
}

export function meta({ loaderData }: Route.MetaArgs) {
  return [{ title: `${loaderData?.project.name ?? "Project"} · Firmsand` }];
}

const linkClass = ({ isActive }: { isActive: boolean }) =>
  `rounded px-3 py-2 text-sm focus-visible:outline-2 focus-visible:outline-lagoon ${isActive ? "bg-lagoon text-white" : "hover:bg-paper"}`;

/** A page whose route sets `handle: { workspace: true }` (the map) fills the window instead of the page column. */
function useWorkspace(): boolean {
  return useMatches().some((match) => (match.handle as { workspace?: boolean } | undefined)?.workspace === true);
}

export default function ProjectLayout({ loaderData }: Route.ComponentProps) {
  const base = `/projects/${loaderData.project.id}`;
  const workspace = useWorkspace();
  return (
    <div className={workspace ? "flex min-h-0 flex-1 flex-col px-3 pt-2 sm:px-4" : "mx-auto max-w-5xl px-6 py-4"} data-workspace={workspace ? "" : undefined}>
      <p className={workspace ? "sr-only" : "text-sm text-muted print:hidden"}>Project · your role: {loaderData.roleLabel}</p>
      <h1 className={workspace ? "truncate text-lg font-semibold text-lagoon-dark" : "text-2xl font-semibold text-lagoon-dark"}>{loaderData.project.name}</h1>
      <nav aria-label="Project" className={workspace ? "mt-1 print:hidden flex gap-1 overflow-x-auto border-b border-line pb-1 [&>a]:shrink-0 [&>a]:py-1" : "mt-3 print:hidden flex flex-wrap gap-1 border-b border-line pb-2"}>
        <NavLink end to={base} className={linkClass}>Overview</NavLink>
        <NavLink to={`${base}/map`} className={linkClass}>Map</NavLink>
        <NavLink to={`${base}/surveys`} className={linkClass}>Surveys</NavLink>
        <NavLink to={`${base}/plans`} className={linkClass}>Dive plans</NavLink>
        <NavLink to={`${base}/dewatering`} className={linkClass}>Dewatering</NavLink>
        <NavLink to={`${base}/water-quality`} className={linkClass}>Water quality</NavLink>
        {loaderData.canReadReports ? <NavLink to={`${base}/days`} className={linkClass}>Daily reports</NavLink> : null}
        {loaderData.canReadFinds ? <NavLink to={`${base}/finds`} className={linkClass}>Finds</NavLink> : null}
        {loaderData.canManageMembers ? <NavLink to={`${base}/members`} className={linkClass}>Members</NavLink> : null}
        {loaderData.canConfigure ? <NavLink to={`${base}/settings`} className={linkClass}>Settings</NavLink> : null}
        {loaderData.canReadAudit ? <NavLink to={`${base}/audit`} className={linkClass}>Audit log</NavLink> : null}
      </nav>
      <StopWorkBanner projectId={loaderData.project.id} {...loaderData.stoppages} />
      {loaderData.heldCellCount > 0 ? (
        <p className="mt-3 rounded border border-danger bg-panel px-3 py-2 text-sm text-danger" data-testid="hold-banner">
          Stop-work hold in force on {loaderData.heldCellCount} cells: they cannot be assigned. <NavLink className="underline" to={`${base}/holds`}>See holds</NavLink>
        </p>
      ) : null}
      <div className={workspace ? "mt-2 min-h-0 flex-1" : "mt-6"}>
        <Outlet />
      </div>
    </div>
  );
}
