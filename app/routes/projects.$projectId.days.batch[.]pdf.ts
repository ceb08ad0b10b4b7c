import { requireRole } from "~/lib/auth/access.server";
import { ValidationError, detailsOf } from "~/lib/errors";
import { batchInputSchema, dailyReportBatchPdf } from "~/models/daily-reports.server";
import type { Route } from "./+types/projects.$projectId.days.batch[.]pdf";

// Up to two weeks of daily reports in one PDF: ?from=YYYY-MM-DD&to=YYYY-MM-DD (both included).

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId, "reports.read");
  const query = batchInputSchema.safeParse(Object.fromEntries(new URL(request.url).searchParams));
  const refused = (message: string) => new Response(message, { status: 422, headers: { "Content-Type": "text/plain; charset=utf-8" } });
  if (!query.success) return refused(`Choose the first and last day of the batch: ${detailsOf(query.error).map((detail) => `${detail.field ?? "day"} ${detail.message}`).join("; ")}.`);
  try {
    const { bytes, filename } = await dailyReportBatchPdf(project, query.data.from, query.data.to);
    return new Response(new Uint8Array(bytes), {
      headers: { "Content-Type": "application/pdf", "Content-Disposition": `attachment; filename="${filename}"`, "Content-Length": String(bytes.byteLength), "Cache-Control": "no-store" },
    });
  } catch (error) {
    if (error instanceof ValidationError) return refused(error.message);
    throw error;
  }
}
