import { z } from "zod";
import { convertLength, type LengthUnit } from "../units";

/**
 * Survey orders of IHO S-44 ed. 6.0.0 (2020), table 1, with the coefficients of the total
 * vertical uncertainty allowed at the 95 % confidence level: TVU = √(a² + (b·d)²), d the depth in
 * metres. a is the part that does not vary with depth, b·d the part that does.
 */
/** The orders, strictest first (a list of its own: a zod enum's `options` put "2" first, as an object's integer keys come first). */
export const SURVEY_ORDERS = ["exclusive", "special", "1a", "1b", "2"] as const;
export const surveyOrderSchema = z.enum(SURVEY_ORDERS);
export type SurveyOrder = z.infer<typeof surveyOrderSchema>;

export const TVU_COEFFICIENTS: Record<SurveyOrder, { aM: number; b: number }> = {
  exclusive: { aM: 0.15, b: 0.0075 },
  special: { aM: 0.25, b: 0.0075 },
  "1a": { aM: 0.5, b: 0.013 },
  "1b": { aM: 0.5, b: 0.013 },
  "2": { aM: 1.0, b: 0.023 },
};

/** Each order's name as the forms show it (IHO S-44 ed. 6.0.0 names them so). */
export const SURVEY_ORDER_NAMES: Record<SurveyOrder, string> = {
  exclusive: "Exclusive order",
  special: "Special order",
  "1a": "Order 1a",
  "1b": "Order 1b",
  "2": "Order 2",
};

/** Where the orders and their coefficients come from, for the forms and the settings history. */
export const SURVEY_ORDER_SOURCE = "IHO S-44 Standards for Hydrographic Surveys, ed. 6.0.0 (2020), table 1";

/** Allowed TVU in metres at a depth in metres (IHO S-44 ed. 6.0.0, table 1). */
export function allowedTvuM(order: SurveyOrder, depthM: number): number {
  const { aM, b } = TVU_COEFFICIENTS[order];
  return Math.sqrt(aM * aM + (b * depthM) ** 2);
}

/** Allowed TVU in project units at a depth in project units (converted to metres for the formula). */
export function allowedTvu(order: SurveyOrder, depth: number, unit: LengthUnit): number {
  const depthM = convertLength(Math.abs(depth), unit, "m");
  return convertLength(allowedTvuM(order, depthM), "m", unit);
}

/** The order's coefficients in a project unit: a (length) and b (a ratio, the same in any unit), so TVU = √(a² + (b·d)²) with d in that unit. */
export function tvuCoefficients(order: SurveyOrder, unit: LengthUnit): { a: number; b: number } {
  const { aM, b } = TVU_COEFFICIENTS[order];
  return { a: convertLength(aM, "m", unit), b };
}
