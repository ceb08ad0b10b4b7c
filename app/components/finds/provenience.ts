import { z } from "zod";
import { localDateTimeToInstant } from "../../../shared/finds/finds";

/**
 * The find forms' shared parts (log a find, log a basket load), browser-safe: what the address may
 * prefill and how the position fields are read.
 */

/** Opened from a dive log entry (`?dive=`) or from a team on the day plan (`?team=&cells=`). */
export const prefillSchema = z.object({
  dive: z.coerce.number().int().positive().optional().catch(undefined),
  team: z.coerce.number().int().positive().optional().catch(undefined),
  cells: z.string().max(4000).optional().catch(undefined),
});

/**
 * The position fields: easting and northing in the project's coordinates, or a latitude and
 * longitude (WGS 84) from a phone; either pair complete or both left empty. Errors name the field.
 */
const coordinate = (label: string, min: number, max: number) =>
  z.string().trim().transform((value, context) => {
    if (value === "") return undefined;
    const number = Number(value);
    if (!Number.isFinite(number) || number < min || number > max) {
      context.addIssue({ code: "custom", message: `${label} is a number${Number.isFinite(min) ? ` from ${min} to ${max}` : ""}` });
      return z.NEVER;
    }
    return number;
  }).optional();
export const positionFieldsSchema = z
  .object({
    positionIn: z.enum(["grid", "latlon"]).catch("grid"),
    easting: coordinate("the easting", -Infinity, Infinity),
    northing: coordinate("the northing", -Infinity, Infinity),
    latitude: coordinate("the latitude", -90, 90),
    longitude: coordinate("the longitude", -180, 180),
  })
  .superRefine((input, context) => {
    const pair = input.positionIn === "grid" ? (["easting", "northing"] as const) : (["latitude", "longitude"] as const);
    const [first, second] = pair;
    if (input[first] !== undefined && input[second] === undefined) context.addIssue({ code: "custom", path: [second], message: `give the ${second} with the ${first}, or neither` });
    if (input[second] !== undefined && input[first] === undefined) context.addIssue({ code: "custom", path: [first], message: `give the ${first} with the ${second}, or neither` });
  });

export type PositionFields = z.output<typeof positionFieldsSchema>;

/** A form's text (trimmed; empty is absent) and numbers. */
export function formFields(form: FormData) {
  const text = (name: string) => {
    const value = form.get(name);
    return typeof value === "string" && value.trim() !== "" ? value.trim() : undefined;
  };
  const number = (name: string) => (text(name) === undefined ? undefined : Number(text(name)));
  return { text, number };
}

/** The provenience fields a find and a basket load share, in the API's shape; the time read in the project's time zone. */
export function provenienceFromForm(form: FormData, timeZone: string) {
  const { text, number } = formFields(form);
  const foundAtLocal = text("foundAt");
  const foundAt = foundAtLocal ? localDateTimeToInstant(foundAtLocal, timeZone)?.toISOString() ?? foundAtLocal : undefined;
  return {
    condition: text("condition"), cell: text("cell"), depthBelowSurface: number("depthBelowSurface"), depthInMuck: number("depthInMuck"),
    foundAt, diveId: number("diveId"), teamId: number("teamId"), finder: text("finder"), fieldTag: text("fieldTag"), idempotencyKey: text("idempotencyKey"),
  };
}

/** A refusal of the position, said on the field it was typed in (easting, or latitude) and naming the pair. */
export function positionErrorsOnFields<Detail extends { field?: string; message: string }>(details: readonly Detail[], where: PositionFields): Array<Detail | { field: string; message: string }> {
  const field = where.positionIn === "grid" ? "easting" : "latitude";
  const named = where.positionIn === "grid" ? "Easting and northing" : "Latitude and longitude";
  return details.map((detail) => (detail.field === "position" ? { field, message: `${named}: ${detail.message}` } : detail));
}
