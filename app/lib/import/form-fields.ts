import { z } from "zod";
import { verticalBiasSchema, type VerticalBias } from "../../../shared/qa/vertical-bias";
import type { SurveyOrder } from "../../../shared/qa/tvu";
import { commitChoicesSchema, importOptionsSchema, type CommitChoices, type ImportOptions } from "./import-options";

/**
 * Upload form fields (the pages' forms and the API's multipart fields, all strings) → import
 * options and commit choices, validated with zod. Problems come back per field in plain words.
 */
export interface FieldProblem {
  field: string;
  message: string;
}

const optionalText = (value: string | undefined) => (value === undefined || value.trim() === "" ? undefined : value.trim());
const flag = (value: string | undefined) => value === "1" || value === "true" || value === "on" || value === "yes";

function parseJsonField(name: string, value: string | undefined, problems: FieldProblem[]): unknown {
  const text = optionalText(value);
  if (text === undefined) return undefined;
  try {
    return JSON.parse(text);
  } catch {
    problems.push({ field: name, message: `${name} is not valid JSON` });
    return undefined;
  }
}

function issuesToProblems(error: z.ZodError, problems: FieldProblem[]) {
  for (const issue of error.issues) {
    const field = issue.path.map(String).join(".") || "form";
    problems.push({ field, message: `${field} ${issue.message}` });
  }
}

/** The bias fields' names, on the pages' forms and the API's multipart fields. */
const BIAS_FIELDS = { value: "verticalBiasValue", unit: "verticalBiasUnit", source: "verticalBiasSource" } as const;

/**
 * A survey's vertical-reference bias from form fields (verticalBiasValue, verticalBiasUnit,
 * verticalBiasSource): null when value and source are both empty; otherwise all are checked and a
 * problem names the field. The unit defaults to the project's.
 */
export function verticalBiasFromFields(fields: Record<string, string | undefined>, projectUnit: "us-ft" | "ft" | "m", problems: FieldProblem[]): VerticalBias | null {
  const valueText = optionalText(fields[BIAS_FIELDS.value]);
  const source = optionalText(fields[BIAS_FIELDS.source]);
  if (valueText === undefined && source === undefined) return null;
  const value = valueText === undefined ? Number.NaN : Number(valueText.replace(",", "."));
  const parsed = verticalBiasSchema.safeParse({ value: Number.isFinite(value) ? value : undefined, unit: optionalText(fields[BIAS_FIELDS.unit]) ?? projectUnit, source: source ?? "" });
  if (parsed.success) return parsed.data;
  for (const issue of parsed.error.issues) {
    const field = BIAS_FIELDS[issue.path[0] as keyof typeof BIAS_FIELDS] ?? BIAS_FIELDS.value;
    const message = issue.path[0] === "value" && valueText !== undefined && !Number.isFinite(value) ? "is not a number" : issue.message;
    problems.push({ field, message: `${field} ${message}` });
  }
  return null;
}

export interface ProjectDefaults {
  crs: string;
  lengthUnit: "us-ft" | "ft" | "m";
  timeZone: string;
  /** The project's IHO S-44 order: a survey sent without one is judged against it. */
  surveyOrder: SurveyOrder;
}

export function importOptionsFromFields(fields: Record<string, string>, defaults: ProjectDefaults): { options: ImportOptions | null; problems: FieldProblem[] } {
  const problems: FieldProblem[] = [];
  const fileHasElevations = flag(fields.fileHasElevations);
  const wseText = optionalText(fields.waterSurfaceElevation);
  const wse = wseText === undefined ? null : Number(wseText.replace(",", "."));
  if (wseText !== undefined && !Number.isFinite(wse)) problems.push({ field: "waterSurfaceElevation", message: "waterSurfaceElevation is not a number" });
  const columns = parseJsonField("columns", fields.columns, problems);
  const verticalBias = verticalBiasFromFields(fields, defaults.lengthUnit, problems);
  const parsed = importOptionsSchema.safeParse({
    kind: optionalText(fields.kind),
    surveyedOn: optionalText(fields.surveyedOn),
    timeZone: optionalText(fields.timeZone) ?? defaults.timeZone,
    waterSurfaceElevation: Number.isFinite(wse) ? wse : null,
    fileHasElevations,
    datum: optionalText(fields.datum) ?? "not stated",
    crs: optionalText(fields.crs) ?? defaults.crs,
    lengthUnit: optionalText(fields.lengthUnit) ?? defaults.lengthUnit,
    // An empty header or null marks the field as not in the file.
    columns: columns === undefined || columns === null || typeof columns !== "object"
      ? columns
      : Object.fromEntries(Object.entries(columns as Record<string, unknown>).map(([field, header]) => [field, typeof header === "string" && header.trim() === "" ? null : header])),
    surveyOrder: optionalText(fields.surveyOrder) ?? defaults.surveyOrder,
    verticalBias,
  });
  if (!parsed.success) issuesToProblems(parsed.error, problems);
  return { options: parsed.success && problems.length === 0 ? parsed.data : null, problems };
}

export function commitChoicesFromFields(fields: Record<string, string>, excludeRows?: number[]): { choices: CommitChoices | null; problems: FieldProblem[] } {
  const problems: FieldProblem[] = [];
  const rows = excludeRows ?? parseJsonField("excludeRows", fields.excludeRows, problems);
  const parsed = commitChoicesSchema.safeParse({
    excludeRows: rows ?? [],
    excludeErrorRows: flag(fields.excludeErrorRows),
    outside: optionalText(fields.outside),
    acceptSameFile: flag(fields.acceptSameFile),
    acceptDepthUnit: flag(fields.acceptDepthUnit),
    acceptBottomShift: flag(fields.acceptBottomShift),
  });
  if (!parsed.success) issuesToProblems(parsed.error, problems);
  return { choices: parsed.success && problems.length === 0 ? parsed.data : null, problems };
}
