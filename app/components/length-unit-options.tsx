import { lengthUnitSchema, unitLabel } from "../../shared/units";

/** The length units as a select's options, named as the unit-label function names them (one list for every picker). */
export function LengthUnitOptions({ withVolume = false }: { withVolume?: boolean }) {
  return (
    <>
      {lengthUnitSchema.options.map((unit) => (
        <option key={unit} value={unit}>
          {unitLabel(unit, "length-long")}{withVolume ? ` (volumes in ${unitLabel(unit, "volume-long")})` : ""}
        </option>
      ))}
    </>
  );
}
