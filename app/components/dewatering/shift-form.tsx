import { useState } from "react";
import { Form } from "react-router";
import { computeShiftFigures, flowFromTotaliser } from "../../../shared/dewatering/shift";
import type { FlowUnit, LengthUnit } from "../../../shared/units";
import type { FieldErrors } from "~/lib/http/form";
import { SubmitButton } from "../submit-button";
import { ComputedFigure, FieldInput, FieldSelect, formatFigure } from "./dewatering-section";

/**
 * The shift log form, phone first: large inputs in one column, and the figures worked out as the
 * operator types, each with its unit and formula (the same function the server stores them with).
 */

const minutesOf = (time: string) => (/^\d{2}:\d{2}$/.test(time) ? Number(time.slice(0, 2)) * 60 + Number(time.slice(3, 5)) : Number.NaN);
const numberOf = (text: string) => (text.trim() === "" ? null : Number(text));

export function ShiftForm(props: {
  lengthUnit: LengthUnit;
  defaultFlowUnit: FlowUnit;
  defaultDate: string;
  solidsSpecificGravity: number;
  tubes: string[];
  errors: FieldErrors;
}) {
  const [values, setValues] = useState({
    date: props.defaultDate, start: "07:00", end: "15:00", pumpHours: "", flowMode: "meter", flowValue: "", flowUnit: props.defaultFlowUnit as string,
    totaliserStart: "", totaliserEnd: "", totaliserUnit: props.defaultFlowUnit === "gpm" ? "gal" : "m3",
    solidsMode: "cw", solidsPercent: "", slurrySg: "", solidsSg: String(props.solidsSpecificGravity),
    polymerProduct: "", polymerLot: "", dose: "", stockPercent: "",
  });
  const change = (event: React.ChangeEvent<HTMLInputElement | HTMLSelectElement>) => setValues((old) => ({ ...old, [event.target.name]: event.target.value }));
  const span = (minutesOf(values.end) - minutesOf(values.start)) / 60;
  const pumpHours = numberOf(values.pumpHours) ?? (span > 0 ? span : Number.NaN);
  const totaliserStart = numberOf(values.totaliserStart);
  const totaliserEnd = numberOf(values.totaliserEnd);
  const slurryFlow = values.flowMode === "meter"
    ? { value: numberOf(values.flowValue) ?? Number.NaN, unit: values.flowUnit as FlowUnit }
    : totaliserStart !== null && totaliserEnd !== null && totaliserEnd > totaliserStart && pumpHours > 0
      ? flowFromTotaliser({ start: totaliserStart, end: totaliserEnd, unit: values.totaliserUnit as "gal" | "m3" }, pumpHours)
      : { value: Number.NaN, unit: values.flowUnit as FlowUnit };
  const flow = Number.isFinite(slurryFlow.value) ? slurryFlow.value : null;
  const gs = numberOf(values.solidsSg) ?? Number.NaN;
  const cw = values.solidsMode === "cw" ? numberOf(values.solidsPercent) : null;
  const sg = values.solidsMode === "sg" ? numberOf(values.slurrySg) : null;
  const dose = numberOf(values.dose);
  const stock = numberOf(values.stockPercent);
  const figures = flow !== null && flow > 0
    ? computeShiftFigures({
        slurryFlow,
        pumpHours,
        solidsByWeight: cw !== null && cw > 0 && cw <= 100 ? cw / 100 : null,
        slurrySpecificGravity: sg !== null && sg > 1 && sg < gs ? sg : null,
        solidsSpecificGravity: gs,
        polymer: dose !== null && dose > 0 && stock !== null && stock > 0 ? { doseMgPerL: dose, stockPercent: stock } : null,
      }, props.lengthUnit)
    : null;
  const errors = props.errors;
  return (
    <Form method="post" className="space-y-4" aria-label="Log a shift">
      <div className="grid gap-3 sm:grid-cols-3">
        <FieldInput label="Date" name="date" type="date" required value={values.date} onChange={change} error={errors.date} />
        <FieldInput label="Start" name="start" type="time" required value={values.start} onChange={change} error={errors.start} />
        <FieldInput label="End" name="end" type="time" required value={values.end} onChange={change} error={errors.end} />
      </div>
      <div className="grid gap-3 sm:grid-cols-2">
        <FieldInput label="Pump hours" name="pumpHours" inputMode="decimal" value={values.pumpHours} onChange={change} error={errors.pumpHours} hint={Number.isFinite(span) && span > 0 ? `blank: the whole shift, ${formatFigure(span, 2)} h` : undefined} />
        <FieldSelect label="Flow measured as" name="flowMode" value={values.flowMode} onChange={change}>
          <option value="meter">slurry flow (flow meter)</option>
          <option value="totaliser">totaliser at the start and end</option>
        </FieldSelect>
      </div>
      {values.flowMode === "meter" ? (
        <div className="grid gap-3 sm:grid-cols-2">
          <FieldInput label="Slurry flow" name="flowValue" inputMode="decimal" required value={values.flowValue} onChange={change} error={errors.flowValue} />
          <FieldSelect label="Flow unit" name="flowUnit" value={values.flowUnit} onChange={change} error={errors.flowUnit}>
            <option value="gpm">gpm (US gallons per minute)</option>
            <option value="m3/h">m³/h</option>
          </FieldSelect>
        </div>
      ) : (
        <div className="grid gap-3 sm:grid-cols-3">
          <FieldInput label="Totaliser at start" name="totaliserStart" inputMode="decimal" required value={values.totaliserStart} onChange={change} error={errors.totaliserStart} />
          <FieldInput label="Totaliser at end" name="totaliserEnd" inputMode="decimal" required value={values.totaliserEnd} onChange={change} error={errors.totaliserEnd}
            hint={flow !== null ? `mean flow over the pump hours: ${formatFigure(flow, 1)} ${slurryFlow.unit === "gpm" ? "gpm" : "m³/h"}` : undefined} />
          <FieldSelect label="Totaliser unit" name="totaliserUnit" value={values.totaliserUnit} onChange={change} error={errors.totaliserUnit}>
            <option value="gal">US gallons</option>
            <option value="m3">m³</option>
          </FieldSelect>
        </div>
      )}
      <fieldset className="space-y-3 rounded border border-line p-3">
        <legend className="px-1 text-sm font-medium">Slurry solids</legend>
        <FieldSelect label="Measured as" name="solidsMode" value={values.solidsMode} onChange={change}>
          <option value="cw">percent solids by weight</option>
          <option value="sg">slurry specific gravity (density meter or mud balance)</option>
        </FieldSelect>
        <div className="grid gap-3 sm:grid-cols-2">
          {values.solidsMode === "cw"
            ? <FieldInput label="Solids by weight (%)" name="solidsPercent" inputMode="decimal" value={values.solidsPercent} onChange={change} error={errors.solidsPercent} />
            : <FieldInput label="Slurry specific gravity" name="slurrySg" inputMode="decimal" value={values.slurrySg} onChange={change} error={errors.slurrySg} />}
          <FieldInput label="Solids specific gravity (Gs)" name="solidsSg" inputMode="decimal" value={values.solidsSg} onChange={change} error={errors.solidsSg} hint="the project's setting, from its lab samples" />
        </div>
      </fieldset>
      <fieldset className="space-y-3 rounded border border-line p-3">
        <legend className="px-1 text-sm font-medium">Polymer</legend>
        <div className="grid gap-3 sm:grid-cols-2">
          <FieldInput label="Product" name="polymerProduct" value={values.polymerProduct} onChange={change} error={errors.polymerProduct} />
          <FieldInput label="Lot" name="polymerLot" value={values.polymerLot} onChange={change} error={errors.polymerLot} />
          <FieldInput label="Stock concentration (%)" name="stockPercent" inputMode="decimal" value={values.stockPercent} onChange={change} error={errors.stockPercent} hint="0.5 % = 5 g per litre" />
          <FieldInput label="Dose (mg/L)" name="dose" inputMode="decimal" value={values.dose} onChange={change} error={errors.dose} />
        </div>
      </fieldset>
      <section aria-label="Computed figures" className="rounded border border-line bg-panel p-3">
        <h3 className="text-sm font-semibold">Worked out as you type</h3>
        {figures === null ? <p className="mt-2 text-sm text-muted">Enter the slurry flow to see the figures.</p> : (
          <dl className="mt-1">
            <ComputedFigure term="Stock solution feed rate" testId="stock-feed-rate" value={formatFigure(figures.stockFeedRate?.value, 1)} unit={figures.stockFeedRate?.label ?? ""} formula={figures.stockFeedRate?.formula ?? "needs a dose and a stock concentration"} />
            <ComputedFigure term="Neat polymer" value={formatFigure(figures.neatPolymer?.value, 2)} unit={figures.neatPolymer?.label ?? ""} formula={figures.neatPolymer?.formula ?? "needs a dose"} />
            <ComputedFigure term="Neat polymer for the shift" value={formatFigure(figures.neatPolymerForShift?.value, 1)} unit={figures.neatPolymerForShift?.label ?? ""} formula={figures.neatPolymerForShift?.formula ?? "needs a dose"} />
            <ComputedFigure term="Slurry specific gravity · solids by volume" value={`${formatFigure(figures.slurrySpecificGravity, 3)} · ${figures.solidsByVolume === null ? "–" : `${formatFigure(figures.solidsByVolume * 100, 1)} %`}`} unit="" formula={figures.slurryFormula ?? "needs solids by weight or the slurry's specific gravity"} />
            <ComputedFigure term="Dry solids rate" value={formatFigure(figures.drySolidsRate?.value, 1)} unit={figures.drySolidsRate?.label ?? ""} formula={figures.drySolidsRate?.formula ?? "needs the slurry's solids"} />
            <ComputedFigure term="Dry solids for the shift" value={formatFigure(figures.drySolids?.value, 1)} unit={figures.drySolids?.label ?? ""} formula={figures.drySolids?.formula ?? "needs the slurry's solids"} />
            <ComputedFigure term="Polymer per dry ton" value={formatFigure(figures.polymerPerDryTon?.value, 2)} unit={figures.polymerPerDryTon?.label ?? ""} formula={figures.polymerPerDryTon?.formula ?? "needs a dose and the slurry's solids"} />
          </dl>
        )}
      </section>
      {props.tubes.length > 0 ? (
        <fieldset className="rounded border border-line p-3">
          <legend className="px-1 text-sm font-medium">Tubes being filled</legend>
          <div className="flex flex-wrap gap-3">
            {props.tubes.map((name) => (
              <label key={name} className="flex items-center gap-2 py-1 text-base"><input type="checkbox" name="tubes" value={name} className="h-5 w-5" /> {name}</label>
            ))}
          </div>
          <p className="mt-1 text-xs text-muted">The shift's slurry and dry solids are shared equally among the tubes ticked.</p>
          {errors.tubes ? <p className="mt-1 text-sm text-danger">{errors.tubes}</p> : null}
        </fieldset>
      ) : null}
      <div>
        <label htmlFor="field-notes" className="block text-sm font-medium">Notes</label>
        <textarea id="field-notes" name="notes" rows={2} className="mt-1 block w-full rounded border border-line bg-panel px-3 py-2 text-base" />
      </div>
      {errors.form ? <p role="alert" className="text-sm text-danger">{errors.form}</p> : null}
      <SubmitButton pendingLabel="Logging…" intent="shift" className="w-full py-3 sm:w-auto">Log the shift</SubmitButton>
    </Form>
  );
}
