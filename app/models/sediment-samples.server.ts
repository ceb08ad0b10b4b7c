import { z } from "zod";
import { parseCellLabel } from "../../shared/grid/cell-grid";
import { densityUnitSchema, kilogramsPerCubicMetreFrom, kilogramsPerCubicMetreTo, massUnitsFor, measureLabel, type DensityUnit } from "../../shared/units";
import { CellResult, SedimentSample, Zone, getSequelize } from "~/lib/db.server";
import { NotFoundError, ValidationError } from "~/lib/errors";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import { workDateSchema } from "./assignments.server";
import { claimIdempotencyKey } from "~/lib/api/idempotency.server";

/**
 * The lab's results for sediment samples, entered by the manager or the resource monitor: what
 * turns the surveyed volume into dry mass (dry bulk density in place) and into nutrients (total N
 * and P on a dry-weight basis). A sample stands for its zone (from its cell when a cell is given),
 * or for the project when it names neither.
 */

const text = (max: number) => z.string().trim().max(max);

export const sampleInputSchema = z.object({
  date: workDateSchema,
  percentSolids: z.number().finite().gt(0, "percent solids is above 0").max(100, "percent solids is at most 100"),
  dryBulkDensity: z.object({
    value: z.number().finite().positive("the dry bulk density is more than 0"),
    unit: z.enum(densityUnitSchema.options, { message: "the density unit is lb/ft3, kg/m3 or g/cm3" }),
  }).refine((density) => kilogramsPerCubicMetreFrom(density.value, density.unit) <= 2650, { message: "a dry bulk density above that of quartz (2.65 g/cm³) is not sediment in place", path: ["value"] }),
  totalNitrogenMgKg: z.number().finite().min(0, "total nitrogen is 0 or more").max(100_000, "total nitrogen above 100,000 mg/kg (10 %) is not sediment"),
  totalPhosphorusMgKg: z.number().finite().min(0, "total phosphorus is 0 or more").max(100_000, "total phosphorus above 100,000 mg/kg (10 %) is not sediment"),
  organicMatterPercent: z.number().finite().min(0).max(100, "organic matter is at most 100 %").nullish(),
  /** The zone's name or id. */
  zone: z.union([text(120).min(1), z.number().int().positive()]).nullish(),
  cell: text(16).min(1).nullish(),
  lab: text(120).default(""),
  reportNumber: text(60).default(""),
});
export type SampleInput = z.infer<typeof sampleInputSchema>;

export interface SampleView {
  id: number;
  date: string;
  zone: { id: number; name: string } | null;
  cell: string | null;
  percentSolids: number;
  dryBulkDensity: { value: number; unit: DensityUnit; label: string };
  dryBulkDensityKgPerM3: number;
  organicMatterPercent: number | null;
  totalNitrogenMgKg: number;
  totalPhosphorusMgKg: number;
  lab: string;
  reportNumber: string;
}

function present(sample: SedimentSample, project: ProjectView): SampleView {
  const unit = massUnitsFor(project.lengthUnit).density;
  return {
    id: sample.id, date: sample.sampledOn, zone: sample.zone ? { id: sample.zone.id, name: sample.zone.name } : null, cell: sample.cellLabel,
    percentSolids: sample.percentSolids,
    dryBulkDensity: { value: kilogramsPerCubicMetreTo(sample.dryBulkDensityKgPerM3, unit), unit, label: measureLabel(unit) },
    dryBulkDensityKgPerM3: sample.dryBulkDensityKgPerM3,
    organicMatterPercent: sample.organicMatterPercent, totalNitrogenMgKg: sample.totalNitrogenMgKg, totalPhosphorusMgKg: sample.totalPhosphorusMgKg,
    lab: sample.lab, reportNumber: sample.reportNumber,
  };
}

async function findSamples(project: ProjectView, id?: number): Promise<SampleView[]> {
  const samples = await SedimentSample.findAll({
    where: { projectId: project.id, ...(id !== undefined ? { id } : {}) },
    include: [{ model: Zone, as: "zone", attributes: ["id", "name"] }],
    order: [["sampledOn", "DESC"], ["id", "DESC"]],
  });
  return samples.map((sample) => present(sample, project));
}

export function listSamples(project: ProjectView): Promise<SampleView[]> {
  return findSamples(project);
}

export async function recordSample(project: ProjectView, user: UserView, input: SampleInput, ip: string | null = null): Promise<SampleView> {
  let zoneId: number | null = null;
  let cellLabel: string | null = null;
  if (input.cell) {
    const position = parseCellLabel(input.cell);
    if (!position) throw new ValidationError({ field: "cell", message: `"${input.cell}" is not a cell label.` });
    const cell = await CellResult.findOne({ where: { projectId: project.id, row: position.row, col: position.col }, attributes: ["zoneId", "label"] });
    if (!cell) throw new NotFoundError({ field: "cell", message: `Cell ${input.cell.toUpperCase()} is not in the work limit's grid.` });
    cellLabel = cell.label;
    zoneId = cell.zoneId === null ? null : Number(cell.zoneId);
  }
  if (input.zone != null) {
    const zones = await Zone.findAll({ where: { projectId: project.id }, attributes: ["id", "name"] });
    const zone = zones.find((candidate) => (typeof input.zone === "number" ? candidate.id === input.zone : candidate.name.toLowerCase() === String(input.zone).toLowerCase()));
    if (!zone) throw new NotFoundError({ field: "zone", message: `There is no zone "${input.zone}" on this project.` });
    if (cellLabel !== null && zoneId !== zone.id) throw new ValidationError({ field: "zone", message: `Cell ${cellLabel} does not lie in zone ${zone.name}.` });
    zoneId = zone.id;
  }
  const id = await getSequelize().transaction(async (transaction) => {
    const idempotency = await claimIdempotencyKey(transaction);
    const sample = await SedimentSample.create(
      {
        projectId: project.id, sampledOn: input.date, zoneId, cellLabel, percentSolids: input.percentSolids,
        dryBulkDensityKgPerM3: kilogramsPerCubicMetreFrom(input.dryBulkDensity.value, input.dryBulkDensity.unit),
        organicMatterPercent: input.organicMatterPercent ?? null, totalNitrogenMgKg: input.totalNitrogenMgKg, totalPhosphorusMgKg: input.totalPhosphorusMgKg,
        lab: input.lab, reportNumber: input.reportNumber, recordedById: user.id,
      },
      { transaction },
    );
    await idempotency.created(sample.id);
    await recordAudit({ action: AUDIT_ACTIONS.sedimentSampleRecorded, projectId: project.id, userId: user.id, ip, detail: { date: input.date, lab: input.lab, reportNumber: input.reportNumber } }, transaction);
    return sample.id;
  });
  return (await findSamples(project, id))[0];
}
