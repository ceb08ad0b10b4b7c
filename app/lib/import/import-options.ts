import { z } from "zod";
import { surveyOrderSchema } from "../../../shared/qa/tvu";
import { verticalBiasSchema } from "../../../shared/qa/vertical-bias";
import { soundingFields } from "../../../shared/soundings/parse-csv";
import { lengthUnitSchema } from "../../../shared/units";

/** What the technician says about an upload (the upload form, the API's multipart fields). */
export function isTimeZone(value: string): boolean {
  try {
    new Intl.DateTimeFormat("en-US", { timeZone: value });
    return true;
  } catch {
    return false;
  }
}

/** Field → header in the file; null marks a field as not in the file (no column is used for it, not even a same-named one). */
export const columnsSchema = z.partialRecord(z.enum(soundingFields), z.string().trim().min(1).max(200).nullable());

export const importOptionsSchema = z
  .object({
    kind: z.enum(["baseline", "progress", "closeout"]),
    surveyedOn: z.iso.date({ message: "give the survey date as YYYY-MM-DD" }),
    timeZone: z.string().trim().min(1).refine(isTimeZone, "is not a time zone name such as America/New_York"),
    waterSurfaceElevation: z.number().finite().nullable(),
    fileHasElevations: z.boolean(),
    datum: z.string().trim().min(1).max(40),
    /** The CRS of the file's coordinates (EPSG code); the project's by default. */
    crs: z.string().trim().min(1).max(40),
    /** The length unit of the file's depths and elevations; the project's by default. */
    lengthUnit: lengthUnitSchema,
    columns: columnsSchema.optional(),
    /** IHO S-44 order the crossings and spikes are judged against (the project's, unless the upload names another). */
    surveyOrder: surveyOrderSchema,
    /** The most the survey's vertical reference may be off (95 %), with its unit and source; null when none is given. */
    verticalBias: verticalBiasSchema.nullable().optional(),
  })
  .superRefine((options, context) => {
    if (!options.fileHasElevations && options.waterSurfaceElevation === null) {
      context.addIssue({ code: "custom", path: ["waterSurfaceElevation"], message: "is required unless the file has elevations" });
    }
  });
export type ImportOptions = z.infer<typeof importOptionsSchema>;

/** Choices made on the preview before committing. */
export const commitChoicesSchema = z.object({
  /** Spreadsheet rows left out on purpose. */
  excludeRows: z.array(z.number().int().positive()).default([]),
  /** Leave out every row with an error (when there are too many to tick one by one). */
  excludeErrorRows: z.boolean().default(false),
  /** Soundings outside the work limit: kept or dropped; required when there are any (never silent). */
  outside: z.enum(["keep", "drop"]).optional(),
  /** Import even though the same file (same content hash) was imported before. */
  acceptSameFile: z.boolean().default(false),
  /** Import even though the depths look like they are in another unit than declared (checked against earlier surveys). */
  acceptDepthUnit: z.boolean().optional(),
  /** Import even though the whole bottom moved against the earlier surveys by far more than dredging could (a wrong water-surface elevation or datum). */
  acceptBottomShift: z.boolean().optional(),
});
export type CommitChoices = z.infer<typeof commitChoicesSchema>;
