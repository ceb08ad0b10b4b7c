import { z } from "zod";
import { convertLength, lengthUnitSchema, unitLabel, type LengthUnit } from "../units";

/**
 * A survey's vertical-reference bias: the most its whole surface may be off (95 %) because of the
 * water level it was read from or its datum (a staff gauge read to 0.05 ft, a datum tie known to
 * 2 cm). It is systematic: every sounding of the survey shares it, so it never averages down. It is
 * recorded as entered (a value, its unit and where the figure comes from) and converted once, here,
 * into the project's unit for the pay period's band (shared/volumes/period-uncertainty.ts).
 */
export interface VerticalBias {
  value: number;
  unit: LengthUnit;
  source: string;
}

/**
 * The largest bias accepted, 1 m (3.28 ft): a reference further off than that is a wrong
 * water-surface elevation or datum, which the import holds as a whole-bottom shift, not a bias.
 * A bound of our own choosing, not a published one.
 */
export const MAX_VERTICAL_BIAS_M = 1;

export const verticalBiasSchema = z
  .object({
    value: z.number({ message: "give the bias as a number, such as 0.05" }).finite().min(0, "is not negative: give how far the reference may be off, either way"),
    unit: lengthUnitSchema,
    source: z.string().trim().min(3, "say where the figure comes from (at least 3 characters), such as \"staff gauge read to 0.05 ft\"").max(200),
  })
  .superRefine((bias, context) => {
    if (convertLength(bias.value, bias.unit, "m") > MAX_VERTICAL_BIAS_M) {
      context.addIssue({
        code: "custom",
        path: ["value"],
        message: `is more than ${MAX_VERTICAL_BIAS_M} m (${convertLength(MAX_VERTICAL_BIAS_M, "m", bias.unit).toFixed(2)} ${unitLabel(bias.unit)}): a reference that far off is a wrong water-surface elevation or datum, not a bias`,
      });
    }
  });

/** The bias in the project's length unit; 0 when none is recorded. */
export function biasInUnit(bias: VerticalBias | null, unit: LengthUnit): number {
  return bias === null ? 0 : convertLength(bias.value, bias.unit, unit);
}

/** "0.05 ft (staff gauge read to 0.05 ft)", or "none recorded". */
export function verticalBiasWords(bias: VerticalBias | null): string {
  return bias === null ? "none recorded" : `${bias.value} ${unitLabel(bias.unit)} (${bias.source})`;
}
