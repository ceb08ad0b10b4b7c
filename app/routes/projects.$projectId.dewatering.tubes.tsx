import { Form, data } from "react-router";
import { can } from "~/lib/auth/permissions";
import { requireRole } from "~/lib/auth/access.server";
import { DomainError, detailsOf } from "~/lib/errors";
import { clientAddress } from "~/lib/http/client-address.server";
import { fieldErrorsFrom, type FieldErrors } from "~/lib/http/form";
import { urlIdSchema } from "~/lib/http/url-id";
import { ActionMessages } from "~/components/form-message";
import { SubmitButton } from "~/components/submit-button";
import { DewateringCaution, DewateringNav, FieldInput, FieldSelect, formatFigure } from "~/components/dewatering/dewatering-section";
import { DEWATERING_CAUTION, changeTube, fillInputSchema, listTubes, recordFill, registerTube, tubeEditSchema, tubeInputSchema, tubeStatusSchema, projectToday } from "~/models/dewatering.server";
import { TUBE_STATUSES } from "../../shared/dewatering/tubes";
import type { Route } from "./+types/projects.$projectId.dewatering.tubes";
import { readPageForm } from "~/lib/http/body.server";

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId);
  const { project } = access;
  const [register, today] = await Promise.all([listTubes(project), projectToday(project)]);
  return { project: { id: project.id }, register, today, canLog: can(access, "dewatering.log"), caution: DEWATERING_CAUTION };
}

type Intent = "register" | "fill" | "status" | "place" | "unplace";
/** `tubeId`: the row whose own form the errors belong to. */
type ActionResult = { intent: Intent; errors: FieldErrors; notice: string | null; tubeId?: number };

/** Which input of a position form each field of the position came from. */
const positionInputOf = (field: string) => (field === "position.x" ? "positionX" : field === "position.y" || field === "position" ? "positionY" : field);

const text = (value: FormDataEntryValue | null) => (typeof value === "string" ? value.trim() : "");
const numberOr = (value: FormDataEntryValue | null) => (text(value) === "" ? Number.NaN : Number(text(value)));

export async function action({ request, params }: Route.ActionArgs) {
  const access = await requireRole(request, params.projectId, "dewatering.log");
  const { user, project } = access;
  const form = await readPageForm(request);
  const intent = text(form.get("intent")) as Intent;
  const refused = (errors: FieldErrors, tubeId?: number) => data({ intent, errors, notice: null, tubeId } satisfies ActionResult, { status: 400 });
  try {
    if (intent === "register") {
      const placed = text(form.get("positionX")) !== "" || text(form.get("positionY")) !== "";
      const bearing = text(form.get("bearingDegrees"));
      const parsed = tubeInputSchema.safeParse({
        name: text(form.get("name")), circumference: numberOr(form.get("circumference")), length: numberOr(form.get("length")),
        capacityDryMassPerLength: numberOr(form.get("capacityDryMassPerLength")), notes: text(form.get("notes")),
        position: placed ? { x: numberOr(form.get("positionX")), y: numberOr(form.get("positionY")) } : null,
        bearingDegrees: bearing === "" ? null : Number(bearing),
      });
      if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), positionInputOf));
      const tube = await registerTube(project, user, parsed.data, clientAddress(request));
      return { intent, errors: {} as FieldErrors, notice: `Registered tube ${tube.name}.` } satisfies ActionResult;
    }
    const tubeId = urlIdSchema.safeParse(text(form.get("tubeId")));
    if (!tubeId.success) return refused({ tubeId: "Choose a tube." });
    if (intent === "fill") {
      const volume = text(form.get("slurryVolume"));
      const parsed = fillInputSchema.safeParse({
        date: text(form.get("date")), drySolids: numberOr(form.get("drySolids")),
        slurryVolume: volume === "" ? null : { value: Number(volume), unit: text(form.get("slurryVolumeUnit")) },
      });
      if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), (field) => field.split(".")[0]));
      const tube = await recordFill(project, user, tubeId.data, parsed.data, clientAddress(request));
      return { intent, errors: {} as FieldErrors, notice: `Recorded a fill of tube ${tube.name}: now ${formatFigure(tube.fillLevel * 100, 0)} % of its capacity.` } satisfies ActionResult;
    }
    if (intent === "status") {
      const parsed = tubeStatusSchema.safeParse({ status: text(form.get("status")) });
      if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), (field) => field));
      const tube = await changeTube(project, user, tubeId.data, { status: parsed.data.status }, clientAddress(request));
      return { intent, errors: {} as FieldErrors, notice: `Tube ${tube.name} is now ${tube.status.replace(/-/g, " ")}.` } satisfies ActionResult;
    }
    if (intent === "place" || intent === "unplace") {
      const bearing = text(form.get("bearingDegrees"));
      const parsed = tubeEditSchema.safeParse(intent === "unplace"
        ? { position: null }
        : { position: { x: numberOr(form.get("positionX")), y: numberOr(form.get("positionY")) }, bearingDegrees: bearing === "" ? null : Number(bearing) });
      if (!parsed.success) return refused(fieldErrorsFrom(detailsOf(parsed.error), positionInputOf), tubeId.data);
      const tube = await changeTube(project, user, tubeId.data, parsed.data, clientAddress(request));
      return { intent, errors: {} as FieldErrors, notice: tube.position ? `Tube ${tube.name} now lies at ${formatFigure(tube.position.x, 1)} E, ${formatFigure(tube.position.y, 1)} N, bearing ${formatFigure(tube.bearingDegrees, 0)}°.` : `Tube ${tube.name} is off the map (still in the register).` } satisfies ActionResult;
    }
    return refused({ form: "Unknown request." });
  } catch (error) {
    if (error instanceof DomainError) return refused(fieldErrorsFrom(error.details, (field) => (field === "tubes" ? "tubeId" : field)));
    throw error;
  }
}

/** Moves a registered tube on the laydown area, or takes it off the map; open when its last try was refused. */
function PlaceTubeForm({ tube, errors }: { tube: Route.ComponentProps["loaderData"]["register"]["tubes"][number]; errors: FieldErrors | null }) {
  return (
    <details className="mt-1" open={errors !== null}>
      <summary className="cursor-pointer text-xs text-lagoon-dark">{tube.position ? "Move on the map" : "Place on the map"}</summary>
      <Form method="post" className="mt-1 grid min-w-56 gap-1" aria-label={`Place of ${tube.name}`}>
        <input type="hidden" name="tubeId" value={tube.id} />
        <FieldInput idPrefix={`tube-${tube.id}`} label="Easting" name="positionX" inputMode="decimal" defaultValue={tube.position?.x ?? ""} error={errors?.positionX} />
        <FieldInput idPrefix={`tube-${tube.id}`} label="Northing" name="positionY" inputMode="decimal" defaultValue={tube.position?.y ?? ""} error={errors?.positionY} />
        <FieldInput idPrefix={`tube-${tube.id}`} label="Bearing (°)" name="bearingDegrees" inputMode="decimal" defaultValue={tube.position ? tube.bearingDegrees : ""} error={errors?.bearingDegrees} hint="from grid north" />
        <div className="flex flex-wrap gap-1">
          <SubmitButton pendingLabel="Saving…" intent="place" tone="plain" className="px-2 py-1">Save place</SubmitButton>
          {tube.position ? <SubmitButton pendingLabel="…" intent="unplace" tone="plain" className="px-2 py-1">Take off the map</SubmitButton> : null}
        </div>
      </Form>
    </details>
  );
}

const STATUS_WORDS: Record<(typeof TUBE_STATUSES)[number], string> = { filling: "filling", dewatering: "dewatering", "ready-to-open": "ready to open", opened: "opened", hauled: "hauled" };

export default function DewateringTubes({ loaderData, actionData }: Route.ComponentProps) {
  const { register, project } = loaderData;
  const errors = actionData?.errors ?? ({} as FieldErrors);
  const errorsFor = (intent: Intent) => (actionData?.intent === intent ? errors : {});
  return (
    <div className="space-y-5">
      <DewateringNav projectId={project.id} />
      <DewateringCaution text={loaderData.caution} />
      <ActionMessages error={errors.form ?? errors.tubeId} notice={actionData?.notice} />
      <section aria-labelledby="tube-register" className="space-y-2">
        <h2 id="tube-register" className="font-semibold">Tube register</h2>
        <p className="text-sm text-muted">
          Fill level = dry solids delivered ÷ (capacity per {register.lengthLabel} × length). A tube at {Math.round(register.nearCapacityShare * 100)} % or more is flagged: stop at the supplier's fill height.
          Theoretical diameter = circumference ÷ π, for reference (a filled tube stands lower). Tubes placed on the laydown area are drawn on the project's map until hauled.
        </p>
        {register.tubes.length === 0 ? <p className="text-sm text-muted">No tubes registered yet.</p> : (
          <div className="overflow-x-auto focus-visible:outline-2 focus-visible:outline-lagoon" tabIndex={0} role="region" aria-label="Tube register, scrollable">
            <table className="w-full border-collapse text-sm">
              <thead>
                <tr className="border-b border-line text-left">
                  <th className="py-1 pr-2">Tube</th><th className="pr-2">Circumference × length ({register.lengthLabel})</th><th className="pr-2 text-right">Theoretical diameter</th>
                  <th className="pr-2 text-right">Capacity ({register.massLabel} dry)</th><th className="pr-2 text-right">Delivered</th><th className="pr-2">Fill level</th><th className="pr-2 text-right">Fills</th><th>Status</th>
                </tr>
              </thead>
              <tbody>
                {register.tubes.map((tube) => (
                  <tr key={tube.id} className="border-b border-line align-top" data-testid={`tube-${tube.name}`}>
                    <td className="py-1 pr-2"><span className="font-medium">{tube.name}</span>{tube.position ? <span className="block text-xs text-muted">on the map</span> : null}</td>
                    <td className="figures pr-2 whitespace-nowrap">{formatFigure(tube.circumference, 1)} × {formatFigure(tube.length, 0)}</td>
                    <td className="text-right figures pr-2 whitespace-nowrap">{formatFigure(tube.theoreticalDiameter, 2)} {register.lengthLabel}</td>
                    <td className="text-right figures pr-2">{formatFigure(tube.capacity, 1)}</td>
                    <td className="text-right figures pr-2">{formatFigure(tube.drySolidsDelivered, 1)}</td>
                    <td className="pr-2 min-w-28">
                      <span className="figures">{formatFigure(tube.fillLevel * 100, 0)} %</span>
                      <div className="mt-1 h-1.5 w-full rounded bg-paper" role="presentation"><div className={`h-1.5 rounded ${tube.nearCapacity ? "bg-danger" : "bg-lagoon"}`} style={{ width: `${Math.min(100, tube.fillLevel * 100)}%` }} /></div>
                      {tube.nearCapacity ? <p className="mt-1 text-xs font-semibold text-danger" data-testid="near-capacity">Near capacity: rupture risk</p> : null}
                    </td>
                    <td className="text-right figures pr-2">{tube.fills.length}</td>
                    <td>
                      {loaderData.canLog ? (
                        <Form method="post" className="flex gap-1">
                          <input type="hidden" name="tubeId" value={tube.id} />
                          <select name="status" defaultValue={tube.status} aria-label={`Status of ${tube.name}`} className="rounded border border-line bg-panel px-2 py-1">
                            {TUBE_STATUSES.map((status) => <option key={status} value={status}>{STATUS_WORDS[status]}</option>)}
                          </select>
                          <SubmitButton pendingLabel="…" intent="status" tone="plain" className="px-2 py-1">Set</SubmitButton>
                        </Form>
                      ) : STATUS_WORDS[tube.status]}
                      {loaderData.canLog ? <PlaceTubeForm tube={tube} errors={actionData && "tubeId" in actionData && actionData.tubeId === tube.id ? errors : null} /> : null}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </section>
      {loaderData.canLog ? (
        <div className="grid gap-5 md:grid-cols-2">
          <section aria-labelledby="register-tube" className="rounded border border-line bg-panel p-4">
            <h2 id="register-tube" className="font-semibold">Register a tube</h2>
            <Form method="post" className="mt-3 space-y-3">
              <FieldInput label="Name" name="name" required error={errorsFor("register").name} />
              <div className="grid grid-cols-2 gap-3">
                <FieldInput label={`Circumference (${register.lengthLabel})`} name="circumference" inputMode="decimal" required error={errorsFor("register").circumference} />
                <FieldInput label={`Length (${register.lengthLabel})`} name="length" inputMode="decimal" required error={errorsFor("register").length} />
              </div>
              <FieldInput label={`Capacity (dry ${register.massLabel} per ${register.lengthLabel})`} name="capacityDryMassPerLength" inputMode="decimal" required error={errorsFor("register").capacityDryMassPerLength} hint="from the supplier's sheet" />
              <fieldset className="rounded border border-line p-3">
                <legend className="px-1 text-sm font-medium">Where it lies on the laydown area</legend>
                <p className="text-xs text-muted">Its centre in the project's coordinates ({register.crs}, {register.lengthLabel}) and which way it runs; the map then draws it. Left blank, the tube is listed but not drawn.</p>
                <div className="mt-2 grid grid-cols-2 gap-3 sm:grid-cols-3">
                  <FieldInput label="Easting" name="positionX" inputMode="decimal" error={errorsFor("register").positionX} />
                  <FieldInput label="Northing" name="positionY" inputMode="decimal" error={errorsFor("register").positionY} />
                  <FieldInput label="Bearing (°)" name="bearingDegrees" inputMode="decimal" error={errorsFor("register").bearingDegrees} hint="from grid north" />
                </div>
              </fieldset>
              <FieldInput label="Notes" name="notes" error={errorsFor("register").notes} />
              <SubmitButton pendingLabel="Registering…" intent="register" className="w-full py-3 sm:w-auto">Register the tube</SubmitButton>
            </Form>
          </section>
          <section aria-labelledby="record-fill" className="rounded border border-line bg-panel p-4">
            <h2 id="record-fill" className="font-semibold">Record a fill</h2>
            <p className="mt-1 text-xs text-muted">Fills logged with a shift are recorded there; use this for a fill metered on its own.</p>
            <Form method="post" className="mt-3 space-y-3">
              <FieldSelect label="Tube" name="tubeId" required error={errorsFor("fill").tubeId}>
                {register.tubes.filter((tube) => tube.status === "filling" || tube.status === "dewatering").map((tube) => <option key={tube.id} value={tube.id}>{tube.name}</option>)}
              </FieldSelect>
              <FieldInput label="Date" name="date" type="date" required defaultValue={loaderData.today} error={errorsFor("fill").date} />
              <FieldInput label={`Estimated dry solids (${register.massLabel})`} name="drySolids" inputMode="decimal" required error={errorsFor("fill").drySolids} />
              <div className="grid grid-cols-2 gap-3">
                <FieldInput label="Slurry volume" name="slurryVolume" inputMode="decimal" error={errorsFor("fill").slurryVolume} hint="if metered" />
                <FieldSelect label="Unit" name="slurryVolumeUnit"><option value="gal">US gallons</option><option value="m3">m³</option></FieldSelect>
              </div>
              <SubmitButton pendingLabel="Recording…" intent="fill" className="w-full py-3 sm:w-auto">Record the fill</SubmitButton>
            </Form>
          </section>
        </div>
      ) : null}
    </div>
  );
}

export function meta() {
  return [{ title: "Geotextile tubes · Firmsand" }];
}
