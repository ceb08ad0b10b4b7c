import { Form, data } from "react-router";
import { can } from "~/lib/auth/permissions";
import { requireRole } from "~/lib/auth/access.server";
import { DomainError, detailsOf } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { fieldErrorsFrom, type FieldErrors } from "~/lib/http/form";
import { ActionMessages } from "~/components/form-message";
import { SubmitButton } from "~/components/submit-button";
import { DewateringNav, FieldInput, FieldSelect, formatFigure } from "~/components/dewatering/dewatering-section";
import { projectToday } from "~/models/dewatering.server";
import { listSamples, recordSample, sampleInputSchema } from "~/models/sediment-samples.server";
import { listZones } from "~/models/project.server";
import { massUnitsFor, measureLabel } from "../../shared/units";
import type { Route } from "./+types/projects.$projectId.dewatering.samples";
import { readPageForm } from "~/lib/http/body.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId);
  const { project } = access;
  const [samples, zones, today] = await Promise.all([listSamples(project), listZones(project), projectToday(project)]);
  const densityUnit = massUnitsFor(project.lengthUnit).density;
  return {
    project: { id: project.id },
    samples,
    zones: zones.map((zone) => ({ id: zone.id, name: zone.name })),
    densityUnit, densityLabel: measureLabel(densityUnit),
    today,
    canRecord: can(access, "samples.record"),
  };
}

const text = (value: FormDataEntryValue | null) => (typeof value === "string" ? value.trim() : "");
const numberOr = (value: FormDataEntryValue | null) => (text(value) === "" ? Number.NaN : Number(text(value)));

export async function action({ request, params }: Route.ActionArgs) {
  const { user, project } = await requireRole(request, params.projectId, "samples.record");
  const form = await readPageForm(request);
  const refused = (errors: FieldErrors) => data({ errors, notice: null as string | null }, { status: 400 });
  if (text(form.get("intent")) !== "sample") return refused({ form: "Unknown request." });
  const organic = text(form.get("organicMatterPercent"));
  const parsed = sampleInputSchema.safeParse({
    date: text(form.get("date")), percentSolids: numberOr(form.get("percentSolids")),
    dryBulkDensity: { value: numberOr(form.get("dryBulkDensity")), unit: text(form.get("densityUnit")) },
    totalNitrogenMgKg: numberOr(form.get("totalNitrogenMgKg")), totalPhosphorusMgKg: numberOr(form.get("totalPhosphorusMgKg")),
    organicMatterPercent: organic === "" ? null : Number(organic),
    zone: Number(text(form.get("zone"))) || null, cell: text(form.get("cell")) || null,
    lab: text(form.get("lab")), reportNumber: text(form.get("reportNumber")),
  });
  const inputOf = (field: string) => field.split(".")[0];
  if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), inputOf));
  try {
    const sample = await recordSample(project, user, parsed.data, clientAddress(request));
    return { errors: {} as FieldErrors, notice: `Recorded the sample of ${sample.date}${sample.zone ? ` for ${sample.zone.name}` : " for the whole project"}.` };
  } catch (error) {
    if (error instanceof DomainError) return refused(fieldErrorsFrom(error.details, inputOf));
    throw error;
  }
}

export default function SedimentSamples({ loaderData, actionData }: Route.ComponentProps) {
  const errors = actionData?.errors ?? ({} as FieldErrors);
  return (
    <div className="space-y-5">
      <DewateringNav projectId={loaderData.project.id} />
      <p className="text-sm text-muted">
        Lab results turn the surveyed volume into dry mass (dry bulk density of the muck in place) and into the nitrogen and phosphorus removed (mg/kg dry weight).
        A sample stands for its zone; one with neither zone nor cell stands for the whole project.
      </p>
      <ActionMessages error={errors.form} notice={actionData?.notice} />
      <section aria-labelledby="sample-list" className="space-y-2">
        <h2 id="sample-list" className="font-semibold">Sediment samples</h2>
        {loaderData.samples.length === 0 ? <p className="text-sm text-muted">No lab results yet.</p> : (
          <div className="overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label="Sediment samples, scrollable">
            <table className="w-full border-collapse text-sm">
              <thead><tr className="border-b border-line text-left"><th className="py-1 pr-2">Date</th><th className="pr-2">Zone · cell</th><th className="pr-2 text-right">Solids</th><th className="pr-2 text-right">Dry bulk density</th><th className="pr-2 text-right">Organic matter</th><th className="pr-2 text-right">Total N (mg/kg)</th><th className="pr-2 text-right">Total P (mg/kg)</th><th>Lab · report</th></tr></thead>
              <tbody>
                {loaderData.samples.map((sample) => (
                  <tr key={sample.id} className="border-b border-line">
                    <td className="figures py-1 pr-2 whitespace-nowrap">{sample.date}</td>
                    <td className="pr-2">{sample.zone?.name ?? "whole project"}{sample.cell ? ` · ${sample.cell}` : ""}</td>
                    <td className="text-right figures pr-2">{formatFigure(sample.percentSolids, 1)} %</td>
                    <td className="text-right figures pr-2 whitespace-nowrap">{formatFigure(sample.dryBulkDensity.value, 2)} {sample.dryBulkDensity.label}</td>
                    <td className="text-right figures pr-2">{sample.organicMatterPercent === null ? "–" : `${formatFigure(sample.organicMatterPercent, 1)} %`}</td>
                    <td className="text-right figures pr-2">{formatFigure(sample.totalNitrogenMgKg, 0)}</td>
                    <td className="text-right figures pr-2">{formatFigure(sample.totalPhosphorusMgKg, 0)}</td>
                    <td>{[sample.lab, sample.reportNumber].filter(Boolean).join(" · ") || "–"}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </section>
      {loaderData.canRecord ? (
        <section aria-labelledby="record-sample" className="rounded border border-line bg-panel p-4">
          <h2 id="record-sample" className="font-semibold">Record a lab result</h2>
          <Form method="post" className="mt-3 grid gap-3 sm:grid-cols-3">
            <FieldInput label="Sampled on" name="date" type="date" required defaultValue={loaderData.today} error={errors.date} />
            <FieldSelect label="Zone" name="zone" error={errors.zone}>
              <option value="">whole project</option>
              {loaderData.zones.map((zone) => <option key={zone.id} value={zone.id}>{zone.name}</option>)}
            </FieldSelect>
            <FieldInput label="Cell (optional)" name="cell" error={errors.cell} />
            <FieldInput label="Percent solids" name="percentSolids" inputMode="decimal" required error={errors.percentSolids} />
            <FieldInput label={`Dry bulk density (${loaderData.densityLabel})`} name="dryBulkDensity" inputMode="decimal" required error={errors.dryBulkDensity} />
            <input type="hidden" name="densityUnit" value={loaderData.densityUnit} />
            <FieldInput label="Organic matter, loss on ignition (%)" name="organicMatterPercent" inputMode="decimal" error={errors.organicMatterPercent} />
            <FieldInput label="Total nitrogen (mg/kg dry)" name="totalNitrogenMgKg" inputMode="decimal" required error={errors.totalNitrogenMgKg} />
            <FieldInput label="Total phosphorus (mg/kg dry)" name="totalPhosphorusMgKg" inputMode="decimal" required error={errors.totalPhosphorusMgKg} />
            <FieldInput label="Lab" name="lab" error={errors.lab} />
            <FieldInput label="Report number" name="reportNumber" error={errors.reportNumber} />
            <div className="sm:col-span-3"><SubmitButton pendingLabel="Recording…" intent="sample" className="w-full py-3 sm:w-auto">Record the result</SubmitButton></div>
          </Form>
        </section>
      ) : null}
    </div>
  );
}

export function meta() {
  return [{ title: "Sediment samples · Firmsand" }];
}
