import { useId } from "react";
import type { VerticalBias } from "../../shared/qa/vertical-bias";
import type { LengthUnit } from "../../shared/units";
import { LengthUnitOptions } from "./length-unit-options";

const fieldClass = "mt-1 block w-full rounded border border-line bg-panel px-3 py-2 focus:outline-2 focus:outline-offset-1 focus:outline-lagoon";

/**
 * A survey's vertical-reference bias: how far its water level or datum may be off (95 %), its unit
 * and where the figure comes from. Optional: left empty, no bias is recorded. Used on the upload
 * form and on the survey's page (fields verticalBiasValue, verticalBiasUnit, verticalBiasSource).
 */
export function VerticalBiasFields({ projectUnit, current = null }: { projectUnit: LengthUnit; current?: VerticalBias | null }) {
  const id = useId();
  return (
    <div className="grid gap-4 sm:grid-cols-[8rem_12rem_1fr]" role="group" aria-labelledby={`${id}-legend`} aria-describedby={`${id}-hint`}>
      <p id={`${id}-legend`} className="text-sm font-medium sm:col-span-3">Reference bias (optional)</p>
      <div>
        <label htmlFor={`${id}-value`} className="block text-sm">Up to ±</label>
        <input id={`${id}-value`} name="verticalBiasValue" inputMode="decimal" defaultValue={current?.value ?? ""} className={`${fieldClass} figures`} />
      </div>
      <div>
        <label htmlFor={`${id}-unit`} className="block text-sm">Unit</label>
        <select id={`${id}-unit`} name="verticalBiasUnit" defaultValue={current?.unit ?? projectUnit} className={fieldClass}>
          <LengthUnitOptions />
        </select>
      </div>
      <div>
        <label htmlFor={`${id}-source`} className="block text-sm">Where the figure comes from</label>
        <input id={`${id}-source`} name="verticalBiasSource" maxLength={200} defaultValue={current?.source ?? ""} placeholder="e.g. staff gauge read to 0.05 ft" className={fieldClass} />
      </div>
      <p id={`${id}-hint`} className="text-sm text-muted sm:col-span-3">
        How far this survey's water-level reading or datum may be off, either way (95 %). Every sounding shares it, so it widens the pay period's ± on removed by the area it moved × the bias and never averages down.
      </p>
    </div>
  );
}
