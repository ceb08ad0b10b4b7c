import { cachedReadFor } from "~/lib/cache/read-cache.server";
import { Form, Link, Outlet, useLocation, useMatches } from "react-router";
import { can, roleAllows, type Action } from "~/lib/auth/permissions";
import { requireRole } from "~/lib/auth/access.server";
import { roleLabel } from "~/lib/auth/roles";
import { StopWorkBanner } from "~/components/stop-work-banner";
import { currentStoppagesFor } from "~/models/stoppages.server";
import { heldCellLabelsFor } from "~/models/holds.server";
import { archiveStateOf } from "~/models/project-archive.server";
import type { Route } from "./+types/projects.$projectId";

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId);
  const { project, role } = access;
  const canReadFinds = can(access, "finds.read");
  return {
    project: { id: project.id, name: project.name },
    roleLabel: roleLabel(role),
    // The tabs follow the role alone: an archived project's members, settings and links stay readable.
    canManageMembers: roleAllows(access, "members.manage"),
    canReadAudit: can(access, "audit.read"),
    canConfigure: roleAllows(access, "project.configure"),
    canReadReports: can(access, "reports.read"),
    canReadQuantities: can(access, "quantities.read"),
    canShare: roleAllows(access, "share-links.manage"),
    // An archived project says so on every page; a site admin can restore it from the banner.
    archive: await cachedReadFor(request, `archive-state:${project.id}`, () => archiveStateOf(project)),
    canRestore: can(access, "project.restore"),
    // The field page (outside this layout) for members who enter field records.
    canEnterField: ["dives.log", "water-quality.record", "finds.log", "wildlife.record"].some((action) => can(access, action as Action)),
    // Open stop-work events and stand-downs show on every project page.
    stoppages: await currentStoppagesFor(request, project),
    canReadFinds,
    // Open stop-work events show on every project page (cells only: never the find).
    heldCellCount: canReadFinds ? (await heldCellLabelsFor(request, project.id)).length : 0,
  };
}

export function meta({ loaderData }: Route.MetaArgs) {
  return [{ title: `${loaderData?.project.name ?? "Project"} · Firmsand` }];
}

/** One tab of the project's bar: `also` lists the sub-pages that belong to it (the plan of a day is the map's). */
interface ProjectTab {
  label: string;
  path: string;
  also?: string[];
  /** A page outside this layout, loaded as a whole document (the field page, which the service worker keeps for offline use). */
  document?: boolean;
}

function projectTabs(data: Route.ComponentProps["loaderData"]): ProjectTab[] {
  const tabs: Array<ProjectTab | false> = [
    { label: "Overview", path: "" },
    data.canEnterField && { label: "Field entry", path: "/field", document: true },
    { label: "Map", path: "/map" },
    { label: "Surveys", path: "/surveys" },
    { label: "Dive plans", path: "/plans", also: ["/teams"] },
    data.canReadQuantities && { label: "Quantities", path: "/quantities" },
    { label: "Dewatering", path: "/dewatering" },
    { label: "Water quality", path: "/water-quality" },
    data.canReadReports && { label: "Daily reports", path: "/days" },
    data.canReadFinds && { label: "Finds", path: "/finds", also: ["/holds"] },
    data.canShare && { label: "Share", path: "/share" },
    data.canManageMembers && { label: "Members", path: "/members" },
    data.canConfigure && { label: "Settings", path: "/settings", also: ["/setup"] },
    data.canReadAudit && { label: "Audit log", path: "/audit" },
  ];
  return tabs.filter((tab): tab is ProjectTab => tab !== false);
}

/** The tab a project page belongs to: its own path or one it lists, matched on whole path segments. */
function isCurrent(tab: ProjectTab, rest: string): boolean {
  if (tab.path === "") return rest === "" || rest === "/";
  return [tab.path, ...(tab.also ?? [])].some((path) => rest === path || rest.startsWith(`${path}/`));
}

const tabClass = (current: boolean) =>
  `rounded px-3 py-2 text-sm focus-visible:outline-2 focus-visible:outline-lagoon ${current ? "bg-lagoon text-white" : "hover:bg-paper"}`;

/** A page whose route sets `handle: { workspace: true }` (the map) fills the window instead of the page column. */
function useWorkspace(): boolean {
  return useMatches().some((match) => (match.handle as { workspace?: boolean } | undefined)?.workspace === true);
}

/** Every page of an archived project: since when, by whom, and that nothing can be changed. */
function ArchivedBanner({ projectId, archivedAt, archivedBy, canRestore }: { projectId: number; archivedAt: string | null; archivedBy: string | null; canRestore: boolean }) {
  return (
    <section aria-label="Archived project" className="mt-3 flex flex-wrap items-center justify-between gap-3 rounded border border-line bg-paper px-3 py-2 text-sm print:border-0" data-testid="archived-banner">
      <p>
        <strong>Archived</strong> since <time className="figures whitespace-nowrap" dateTime={archivedAt ?? undefined}>{archivedAt?.slice(0, 10)}</time>{archivedBy ? <> by {archivedBy}</> : null}.
        {" "}This project is read-only: everything can be read and exported, nothing can be changed.{canRestore ? "" : " A site admin can restore it."}
      </p>
      {canRestore ? (
        <Form method="post" action={`/projects/${projectId}/restore`} onSubmit={(event) => { if (!window.confirm("Restore this project? Its members can change its records again.")) event.preventDefault(); }}>
          <button type="submit" className="rounded border border-line bg-panel px-3 py-1 font-medium hover:bg-paper focus-visible:outline-2 focus-visible:outline-lagoon">Restore project</button>
        </Form>
      ) : null}
    </section>
  );
}

export default function ProjectLayout({ loaderData }: Route.ComponentProps) {
  const base = `/projects/${loaderData.project.id}`;
  const rest = useLocation().pathname.slice(base.length);
  const workspace = useWorkspace();
  return (
    <main className={workspace ? "flex min-h-0 flex-1 flex-col px-3 pt-2 sm:px-4" : "mx-auto max-w-5xl px-6 py-4"} data-workspace={workspace ? "" : undefined}>
      <p className={workspace ? "sr-only" : "text-sm text-muted print:hidden"}>Project · your role: {loaderData.roleLabel}</p>
      <h1 className={workspace ? "truncate text-lg font-semibold text-lagoon-dark" : "text-2xl font-semibold text-lagoon-dark"}>{loaderData.project.name}</h1>
      <nav aria-label="Project" className={workspace ? "mt-1 print:hidden flex gap-1 overflow-x-auto border-b border-line pb-1 [&>a]:shrink-0 [&>a]:py-1" : "mt-3 print:hidden flex flex-wrap gap-1 border-b border-line pb-2"}>
        {projectTabs(loaderData).map((tab) => {
          const current = isCurrent(tab, rest);
          return (
            <Link key={tab.path} to={`${base}${tab.path}`} reloadDocument={tab.document} className={tabClass(current)} aria-current={current ? "page" : undefined}>{tab.label}</Link>
          );
        })}
      </nav>
      {loaderData.archive.archivedAt ? <ArchivedBanner projectId={loaderData.project.id} {...loaderData.archive} canRestore={loaderData.canRestore} /> : null}
      <StopWorkBanner projectId={loaderData.project.id} {...loaderData.stoppages} />
      {loaderData.heldCellCount > 0 ? (
        <p className="mt-3 rounded border border-danger bg-panel px-3 py-2 text-sm text-danger" data-testid="hold-banner">
          Stop-work hold in force on {loaderData.heldCellCount} cells: they cannot be assigned. <Link className="underline" to={`${base}/holds`}>See holds</Link>
        </p>
      ) : null}
      <div className={workspace ? "mt-2 min-h-0 flex-1" : "mt-6"}>
        <Outlet />
      </div>
    </main>
  );
}
