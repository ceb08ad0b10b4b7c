import { z } from "zod";
import { csvLine } from "../../shared/csv-safe";
import { requireRole } from "~/lib/auth/access.server";
import { listReadings } from "~/models/water-quality.server";
import type { Route } from "./+types/projects.$projectId.water-quality.readings[.]csv";

// The readings and their verdicts as CSV, formula-safe (shared/csv-safe.ts): station names, notes
// and samplers are typed by people and may begin with "=".

const querySchema = z.object({ from: z.iso.date().optional().catch(undefined), to: z.iso.date().optional().catch(undefined), station: z.string().max(120).optional().catch(undefined) });

export async function loader({ request, params }: Route.LoaderArgs) {
  const { project } = await requireRole(request, params.projectId);
  const query = querySchema.parse(Object.fromEntries(new URL(request.url).searchParams));
  const readings = await listReadings(project, query);
  const header = ["station", "station_kind", "taken_at_utc", "local_day", "value", "unit", "background_ntu", "difference_ntu", "limit_ntu", "verdict", "depth", "instrument", "calibrated_at_utc", "sampled_by", "ph", "dissolved_oxygen_mg_l", "temperature_c", "note"];
  const lines = readings.map((reading) => csvLine([
    reading.station, reading.stationKind, reading.takenAt, reading.localDay, reading.value, reading.unit,
    reading.evaluation?.background ?? null, reading.evaluation?.difference ?? null, reading.evaluation?.limit ?? null,
    reading.evaluation ? (reading.evaluation.exceeds === null ? "unpaired" : reading.evaluation.exceeds ? "exceeds" : "within") : null,
    reading.depth, reading.instrument, reading.calibratedAt, reading.sampledBy, reading.ph, reading.dissolvedOxygen, reading.temperature, reading.note,
  ], 2));
  return new Response(csvLine(header) + lines.join(""), {
    headers: { "Content-Type": "text/csv; charset=utf-8", "Content-Disposition": `attachment; filename="${project.slug}-water-quality-${query.from ?? "all"}-${query.to ?? "all"}.csv"`, "Cache-Control": "no-store" },
  });
}
