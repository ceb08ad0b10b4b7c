import { pageParam, requireRole } from "~/lib/auth/access.server";
import { dailyReportPdf, dayParam } from "~/models/daily-reports.server";
import type { Route } from "./+types/projects.$projectId.days.$date.report[.]pdf";

// The day's report as a PDF (the same compiled figures as the page); a signed report's file is
// stored once per state and served from storage.

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId, "reports.read");
  const date = pageParam(() => dayParam(params.date));
  const { bytes, filename } = await dailyReportPdf(project, date);
  return new Response(new Uint8Array(bytes), {
    headers: { "Content-Type": "application/pdf", "Content-Disposition": `attachment; filename="${filename}"`, "Content-Length": String(bytes.byteLength), "Cache-Control": "no-store" },
  });
}
