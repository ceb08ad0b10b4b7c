import { Form, data } from "react-router";
import { can } from "~/lib/auth/permissions";
import { requireAllowed, requireRole } from "~/lib/auth/access.server";
import { DomainError, detailsOf } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { fieldErrorsFrom, type FieldErrors } from "~/lib/http/form";
import { ActionMessages } from "~/components/form-message";
import { SubmitButton } from "~/components/submit-button";
import { DewateringCaution, DewateringNav, FieldInput, formatFigure } from "~/components/dewatering/dewatering-section";
import { ShiftForm } from "~/components/dewatering/shift-form";
import { SolidsCharts } from "~/components/dewatering/solids-charts";
import { loadSolidsCharts } from "~/models/reconciliation.server";
import {
  DEWATERING_CAUTION, dewateringSettings, dewateringSettingsSchema, listShifts, listTubes, recordShift, shiftInputSchema, updateDewateringSettings, projectToday,
} from "~/models/dewatering.server";
import { massUnitsFor } from "../../shared/units";
import type { Route } from "./+types/projects.$projectId.dewatering";
import { readPageForm } from "~/lib/http/body.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId);
  const { project } = access;
  const [shifts, register, settings, today, charts] = await Promise.all([listShifts(project), listTubes(project), dewateringSettings(project), projectToday(project), loadSolidsCharts(project)]);
  return {
    project: { id: project.id, lengthUnit: project.lengthUnit },
    shifts,
    charts,
    fillableTubes: register.tubes.filter((tube) => tube.status === "filling" || tube.status === "dewatering").map((tube) => tube.name),
    settings,
    today,
    defaultFlowUnit: massUnitsFor(project.lengthUnit).flow,
    canLog: can(access, "dewatering.log"),
    canConfigure: can(access, "project.configure"),
    caution: DEWATERING_CAUTION,
  };
}

type ActionResult = { intent: "shift" | "settings"; errors: FieldErrors; notice: string | null };

const text = (value: FormDataEntryValue | null) => (typeof value === "string" ? value.trim() : "");
const optionalNumber = (value: FormDataEntryValue | null) => (text(value) === "" ? null : Number(text(value)));

/** The form's inputs as the API's shift body: percents become shares, an empty polymer is none. */
function shiftBodyFrom(form: FormData) {
  const solidsPercent = text(form.get("solidsMode")) === "sg" ? null : optionalNumber(form.get("solidsPercent"));
  const hasPolymer = ["polymerProduct", "dose", "stockPercent"].some((name) => text(form.get(name)) !== "");
  return {
    date: text(form.get("date")), start: text(form.get("start")), end: text(form.get("end")),
    pumpHours: optionalNumber(form.get("pumpHours")),
    ...(text(form.get("flowMode")) === "totaliser"
      ? { totaliser: { start: optionalNumber(form.get("totaliserStart")) ?? Number.NaN, end: optionalNumber(form.get("totaliserEnd")) ?? Number.NaN, unit: text(form.get("totaliserUnit")) } }
      : { slurryFlow: { value: optionalNumber(form.get("flowValue")) ?? Number.NaN, unit: text(form.get("flowUnit")) } }),
    solidsByWeight: solidsPercent === null ? null : solidsPercent / 100,
    slurrySpecificGravity: text(form.get("solidsMode")) === "sg" ? optionalNumber(form.get("slurrySg")) : null,
    solidsSpecificGravity: optionalNumber(form.get("solidsSg")),
    polymer: hasPolymer
      ? { product: text(form.get("polymerProduct")), lot: text(form.get("polymerLot")) || null, doseMgPerL: optionalNumber(form.get("dose")) ?? Number.NaN, stockPercent: optionalNumber(form.get("stockPercent")) ?? Number.NaN }
      : null,
    tubes: form.getAll("tubes").filter((value): value is string => typeof value === "string"),
    notes: text(form.get("notes")),
  };
}

/** Which input of the form each field of the shift body came from. */
const SHIFT_INPUTS: Record<string, string> = {
  "slurryFlow.value": "flowValue", "slurryFlow.unit": "flowUnit", slurryFlow: "flowValue",
  "totaliser.start": "totaliserStart", "totaliser.end": "totaliserEnd", "totaliser.unit": "totaliserUnit", solidsByWeight: "solidsPercent", slurrySpecificGravity: "slurrySg",
  solidsSpecificGravity: "solidsSg", "polymer.product": "polymerProduct", "polymer.lot": "polymerLot", "polymer.doseMgPerL": "dose", "polymer.stockPercent": "stockPercent",
};
const shiftInputOf = (field: string) => SHIFT_INPUTS[field] ?? field.split(".")[0];

export async function action({ request, params }: Route.ActionArgs) {
  const access = await requireRole(request, params.projectId);
  const { user, project } = access;
  const form = await readPageForm(request);
  const intent = text(form.get("intent"));
  // The manager's settings form is the only thing here that is not the operator's log.
  requireAllowed(access, intent === "settings" ? "project.configure" : "dewatering.log");
  const refused = (result: ActionResult) => data(result, { status: 400 });
  try {
    if (intent === "shift") {
      const parsed = shiftInputSchema.safeParse(shiftBodyFrom(form));
      if (!parsed.success) {
        const errors = fieldErrorsFrom(detailsOf(parsed.error), shiftInputOf);
        if (errors.solidsPercent) errors.solidsPercent = "Solids by weight is a percent above 0 and at most 100.";
        return refused({ intent, errors, notice: null });
      }
      const { shift } = await recordShift(project, user, parsed.data, clientAddress(request));
      const dry = shift.computed.drySolids;
      return { intent, errors: {} as FieldErrors, notice: `Logged the shift of ${shift.date}, ${shift.start}–${shift.end}${dry ? `: ${formatFigure(dry.value, 1)} ${dry.label}` : ""}.` } satisfies ActionResult;
    }
    if (intent === "settings") {
      const cake = optionalNumber(form.get("cakeSolidsPercent"));
      const nearCapacity = optionalNumber(form.get("nearCapacityPercent"));
      const parsed = dewateringSettingsSchema.safeParse({
        solidsSpecificGravity: optionalNumber(form.get("solidsSpecificGravity")) ?? Number.NaN, cakeSolidsByWeight: cake === null ? null : cake / 100,
        tubeNearCapacityShare: nearCapacity === null ? Number.NaN : nearCapacity / 100,
      });
      const inputOf = (field: string) => (field === "cakeSolidsByWeight" ? "cakeSolidsPercent" : field === "tubeNearCapacityShare" ? "nearCapacityPercent" : field);
      if (!parsed.success) return refused({ intent, errors: fieldErrorsFrom(detailsOf(parsed.error), inputOf), notice: null });
      await updateDewateringSettings(project, user, parsed.data, clientAddress(request));
      return { intent, errors: {} as FieldErrors, notice: "Saved the dewatering settings; shifts and tickets logged from now on use them." } satisfies ActionResult;
    }
    return refused({ intent: "shift", errors: { form: "Unknown request." } as FieldErrors, notice: null });
  } catch (error) {
    if (error instanceof DomainError) return refused({ intent: intent === "settings" ? "settings" : "shift", errors: fieldErrorsFrom(error.details, shiftInputOf), notice: null });
    throw error;
  }
}

function ShiftTable({ shifts }: { shifts: Route.ComponentProps["loaderData"]["shifts"] }) {
  if (shifts.length === 0) return <p className="text-sm text-muted">No shifts logged yet.</p>;
  return (
    <div className="overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label="Shifts, scrollable">
      <table className="w-full border-collapse text-sm">
        <thead>
          <tr className="border-b border-line text-left">
            <th className="py-1 pr-2">Date</th><th className="pr-2">Time</th><th className="pr-2 text-right">Pump h</th><th className="pr-2 text-right">Flow</th>
            <th className="pr-2 text-right">Solids</th><th className="pr-2 text-right">Dose</th><th className="pr-2 text-right">Stock feed</th><th className="pr-2 text-right">Dry solids</th><th className="pr-2 text-right">Polymer per dry ton</th><th>Tubes</th>
          </tr>
        </thead>
        <tbody>
          {shifts.map((shift) => (
            <tr key={shift.id} className="border-b border-line align-top">
              <td className="figures py-1 pr-2 whitespace-nowrap">{shift.date}</td>
              <td className="figures pr-2 whitespace-nowrap">{shift.start}–{shift.end}</td>
              <td className="figures pr-2 text-right">{formatFigure(shift.pumpHours, 2)}</td>
              <td className="figures pr-2 text-right whitespace-nowrap">{formatFigure(shift.slurryFlow.value, 0)} {shift.slurryFlow.label}</td>
              <td className="figures pr-2 text-right whitespace-nowrap">{shift.solidsByWeight !== null ? `Cw ${formatFigure(shift.solidsByWeight * 100, 1)} %` : shift.slurrySpecificGravity !== null ? `SG ${shift.slurrySpecificGravity}` : "–"}</td>
              <td className="figures pr-2 text-right whitespace-nowrap" title={shift.polymer ? [shift.polymer.product, shift.polymer.lot].filter(Boolean).join(", ") : undefined}>{shift.polymer ? `${shift.polymer.doseMgPerL} mg/L` : "–"}</td>
              <td className="figures pr-2 text-right whitespace-nowrap">{shift.computed.stockFeedRate ? `${formatFigure(shift.computed.stockFeedRate.value, 1)} ${shift.computed.stockFeedRate.label}` : "–"}</td>
              <td className="figures pr-2 text-right whitespace-nowrap">{shift.computed.drySolids ? `${formatFigure(shift.computed.drySolids.value, 1)} ${shift.computed.drySolids.label}` : "–"}</td>
              <td className="figures pr-2 text-right whitespace-nowrap">{shift.computed.polymerPerDryTon ? `${formatFigure(shift.computed.polymerPerDryTon.value, 2)} ${shift.computed.polymerPerDryTon.label}` : "–"}</td>
              <td>{shift.tubes.join(", ") || "–"}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

export default function DewateringShifts({ loaderData, actionData }: Route.ComponentProps) {
  const { project, settings } = loaderData;
  const shiftErrors = actionData?.intent === "shift" ? actionData.errors : ({} as FieldErrors);
  const settingsErrors = actionData?.intent === "settings" ? actionData.errors : ({} as FieldErrors);
  return (
    <div className="space-y-5">
      <DewateringNav projectId={project.id} />
      <DewateringCaution text={loaderData.caution} />
      {loaderData.canLog ? (
        <section aria-labelledby="log-shift" className="rounded border border-line bg-panel p-4">
          <h2 id="log-shift" className="mb-3 font-semibold">Log a shift</h2>
          <ActionMessages notice={actionData?.intent === "shift" ? actionData.notice : null} />
          <ShiftForm
            key={actionData?.notice ?? "form"}
            lengthUnit={project.lengthUnit} defaultFlowUnit={loaderData.defaultFlowUnit} defaultDate={loaderData.today}
            solidsSpecificGravity={settings.solidsSpecificGravity} tubes={loaderData.fillableTubes} errors={shiftErrors}
          />
        </section>
      ) : null}
      <section aria-labelledby="shift-list" className="space-y-2">
        <h2 id="shift-list" className="font-semibold">Shifts</h2>
        <ShiftTable shifts={loaderData.shifts} />
      </section>
      <section aria-labelledby="solids-charts" className="space-y-2">
        <h2 id="solids-charts" className="font-semibold">Solids and polymer over time</h2>
        <SolidsCharts charts={loaderData.charts} />
      </section>
      {loaderData.canConfigure ? (
        <section aria-labelledby="dewatering-settings" className="rounded border border-line bg-panel p-4">
          <h2 id="dewatering-settings" className="font-semibold">Dewatering settings</h2>
          <p className="mt-1 text-sm text-muted">The solids' specific gravity (2.65 is mineral sand; organic muck is far lighter: take it from the project's lab samples), the cake solids a haul ticket without its own sample is counted at, and the share of a tube's capacity at which the register flags it (from the supplier's sheet or the site plan).</p>
          <ActionMessages notice={actionData?.intent === "settings" ? actionData.notice : null} />
          <Form method="post" className="mt-3 grid gap-3 sm:grid-cols-4 sm:items-end">
            <FieldInput label="Solids specific gravity" name="solidsSpecificGravity" inputMode="decimal" defaultValue={settings.solidsSpecificGravity} error={settingsErrors.solidsSpecificGravity} />
            <FieldInput label="Default cake solids (%)" name="cakeSolidsPercent" inputMode="decimal" defaultValue={settings.cakeSolidsByWeight === null ? "" : formatFigure(settings.cakeSolidsByWeight * 100, 2)} error={settingsErrors.cakeSolidsPercent} hint="blank: every ticket gives its own" />
            <FieldInput label="Flag tubes near capacity at (%)" name="nearCapacityPercent" inputMode="decimal" defaultValue={formatFigure(settings.tubeNearCapacityShare * 100, 1)} error={settingsErrors.nearCapacityPercent} hint="of the capacity on the supplier's sheet" />
            <SubmitButton pendingLabel="Saving…" intent="settings" tone="plain">Save settings</SubmitButton>
          </Form>
        </section>
      ) : null}
    </div>
  );
}

export function meta() {
  return [{ title: "Dewatering · Firmsand" }];
}
