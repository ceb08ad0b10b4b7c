import { Link } from "react-router";
import { z } from "zod";
import { requireRole } from "~/lib/auth/access.server";
import { listProjectAuditEvents } from "~/lib/audit/audit.server";
import type { Route } from "./+types/projects.$projectId.audit";

const querySchema = z.object({ page: z.coerce.number().int().min(1).max(100_000).catch(1) });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId, "audit.read");
  const { page } = querySchema.parse(Object.fromEntries(new URL(request.url).searchParams));
  return { projectId: project.id, ...(await listProjectAuditEvents(project, page)) };
}

export function meta({}: Route.MetaArgs) {
  return [{ title: "Audit log · Firmsand" }];
}

function describe(detail: Record<string, unknown>): string {
  return Object.entries(detail).map(([key, value]) => `${key}: ${String(value)}`).join(", ");
}

export default function ProjectAudit({ loaderData }: Route.ComponentProps) {
  const { events, page, pageCount, projectId } = loaderData;
  const base = `/projects/${projectId}/audit`;
  return (
    <section aria-labelledby="audit-heading">
      <h2 id="audit-heading" className="text-lg font-semibold">Audit log</h2>
      {events.length === 0 ? (
        <p className="mt-2 text-sm text-muted">Nothing recorded yet.</p>
      ) : (
        <table className="mt-3 w-full text-left text-sm">
          <thead><tr className="border-b border-line"><th className="py-2">When (UTC)</th><th>Who</th><th>What</th><th>Detail</th><th>From</th></tr></thead>
          <tbody>
            {events.map((event) => (
              <tr key={event.id} className="border-b border-line align-top">
                <td className="py-1 whitespace-nowrap"><time dateTime={event.at}>{event.at.replace("T", " ").slice(0, 19)}</time></td>
                <td>{event.actor ?? "—"}</td>
                <td>{event.action}</td>
                <td>{describe(event.detail)}</td>
                <td>{event.ip ?? "—"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <nav aria-label="Audit log pages" className="mt-4 flex items-center gap-4 text-sm">
        {page > 1 ? <Link className="text-lagoon underline" to={`${base}?page=${page - 1}`}>Newer</Link> : null}
        <span>Page {page} of {pageCount}</span>
        {page < pageCount ? <Link className="text-lagoon underline" to={`${base}?page=${page + 1}`}>Older</Link> : null}
      </nav>
    </section>
  );
}
