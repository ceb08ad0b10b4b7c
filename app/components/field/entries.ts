import type { z } from "zod";
import { FIND_CATEGORY_LABELS, type FindCategory } from "../../../shared/finds/finds";
import { localDayOf } from "../../../shared/local-time";
import { diveInputSchema, fillInputSchema, findInputSchema, readingInputSchema, sightingInputSchema, tubeStatusSchema } from "~/lib/field-records/inputs";
import type { FieldSnapshot } from "~/models/field-snapshot";
import type { EntryKind } from "./store";

/**
 * The four field entries the page takes offline: what each form holds, the API body it becomes,
 * and the check with the server's own schema, so an entry the server would refuse is never queued.
 */

export type FormValues = Record<string, string | boolean>;

export const ENTRY_LABELS: Record<EntryKind, string> = { dive: "Dive log entry", reading: "Turbidity reading", find: "Find", sighting: "Wildlife sighting", "tube-fill": "Tube fill", "tube-status": "Tube status" };

const pad = (value: number) => String(value).padStart(2, "0");

/** The device's clock as ISO 8601 with the device's own offset, e.g. 2026-12-03T10:42:05-05:00. */
export function deviceIso(date: Date): string {
  const offset = -date.getTimezoneOffset();
  const sign = offset >= 0 ? "+" : "-";
  const abs = Math.abs(offset);
  return `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())}T${pad(date.getHours())}:${pad(date.getMinutes())}:${pad(date.getSeconds())}${sign}${pad(Math.floor(abs / 60))}:${pad(abs % 60)}`;
}

/** A date-time field's value (device clock, to the minute). */
export function localInputValue(date: Date): string {
  return `${date.getFullYear()}-${pad(date.getMonth() + 1)}-${pad(date.getDate())}T${pad(date.getHours())}:${pad(date.getMinutes())}`;
}

/** A date-time field's value as an instant with the device's offset; empty or unreadable stays as typed so the schema names it. */
function instantOf(value: string | boolean | undefined): string | undefined {
  if (typeof value !== "string" || value.trim() === "") return undefined;
  const date = new Date(value);
  return Number.isNaN(date.getTime()) ? value : deviceIso(date);
}

const text = (form: FormValues, name: string) => {
  const value = form[name];
  return typeof value === "string" && value.trim() !== "" ? value.trim() : undefined;
};
/** A number field: absent when empty; what was typed (a string) when it is not a number, so the schema refuses it by name. */
const number = (form: FormValues, name: string): number | string | undefined => {
  const value = text(form, name);
  if (value === undefined) return undefined;
  const parsed = Number(value.replace(",", "."));
  return Number.isFinite(parsed) ? parsed : value;
};
const idOrName = (form: FormValues, name: string) => {
  const value = text(form, name);
  return value !== undefined && /^\d+$/.test(value) ? Number(value) : value;
};

/** A new entry's form: times from the device's clock now, the dive's day in the project's time zone. */
export function blankForm(kind: EntryKind, snapshot: FieldSnapshot, now: Date): FormValues {
  const at = localInputValue(now);
  switch (kind) {
    case "dive":
      return { date: localDayOf(now.getTime(), snapshot.project.timeZone), team: snapshot.teams.length === 1 ? String(snapshot.teams[0].id) : "", diver: "", visitor: false, leftSurface: "", leftBottom: "", bottomMinutes: "", maxDepth: "", cells: "", notes: "" };
    case "reading":
      return { station: snapshot.stations.length === 1 ? String(snapshot.stations[0].id) : "", takenAt: at, value: "", unit: "NTU", sampledBy: "", note: "" };
    case "find":
      return { category: "", description: "", cell: "", foundAt: at, count: "1", finder: "", fieldTag: "", depthBelowSurface: "" };
    case "sighting":
      return { species: "", seenAt: at, distance: "", gone: false, observer: "", note: "" };
    case "tube-fill":
      return { tube: snapshot.tubes.length === 1 ? String(snapshot.tubes[0].id) : "", date: localDayOf(now.getTime(), snapshot.project.timeZone), drySolids: "", slurryVolume: "", slurryUnit: "gal" };
    case "tube-status":
      return { tube: snapshot.tubes.length === 1 ? String(snapshot.tubes[0].id) : "", status: "" };
  }
}

/** The API's JSON body for a form (field names are the body's). */
export function bodyOf(kind: EntryKind, form: FormValues): Record<string, unknown> {
  switch (kind) {
    case "dive": {
      const cells = (text(form, "cells") ?? "").split(/[\s,;]+/).filter(Boolean).map((label) => label.toUpperCase());
      return {
        date: text(form, "date"), team: idOrName(form, "team"), diver: text(form, "diver"), visitor: form.visitor === true,
        leftSurface: text(form, "leftSurface") ?? null, leftBottom: text(form, "leftBottom") ?? null, bottomMinutes: number(form, "bottomMinutes") ?? null,
        maxDepth: number(form, "maxDepth"), cells, notes: text(form, "notes") ?? "",
      };
    }
    case "reading":
      return { station: idOrName(form, "station"), takenAt: instantOf(form.takenAt), value: number(form, "value"), unit: text(form, "unit"), sampledBy: text(form, "sampledBy") ?? null, note: text(form, "note") ?? null };
    case "find":
      return {
        category: text(form, "category"), description: text(form, "description"), cell: text(form, "cell")?.toUpperCase() ?? null, foundAt: instantOf(form.foundAt),
        count: number(form, "count") ?? 1, finder: text(form, "finder") ?? null, fieldTag: text(form, "fieldTag") ?? null, depthBelowSurface: number(form, "depthBelowSurface") ?? null,
      };
    case "sighting":
      return { species: text(form, "species"), seenAt: instantOf(form.seenAt), distance: number(form, "distance") ?? null, gone: form.gone === true, observer: text(form, "observer"), note: text(form, "note") ?? null };
    case "tube-fill": {
      const volume = number(form, "slurryVolume");
      return { date: text(form, "date") ?? "", drySolids: number(form, "drySolids"), slurryVolume: volume === undefined ? null : { value: volume, unit: text(form, "slurryUnit") } };
    }
    case "tube-status":
      // The tube is the address (dewatering/tubes/<id>), not part of the body.
      return { status: text(form, "status") };
  }
}

const SCHEMAS: Record<EntryKind, z.ZodType> = { dive: diveInputSchema, reading: readingInputSchema, find: findInputSchema, sighting: sightingInputSchema, "tube-fill": fillInputSchema, "tube-status": tubeStatusSchema };

/** The server's own check, run on the device: errors per form field (first message each). */
export function checkBody(kind: EntryKind, body: Record<string, unknown>, form: FormValues = {}): Record<string, string> {
  const result = SCHEMAS[kind].safeParse(body);
  const errors: Record<string, string> = {};
  if ((kind === "tube-status" || kind === "tube-fill") && !text(form, "tube")) errors.tube = "choose the tube";
  if (kind === "dive" && body.team === undefined) errors.team = "choose the team";
  if (result.success) return errors;
  for (const issue of result.error.issues) {
    const key = String(issue.path[0] ?? "form");
    // A field left empty is absent from the body: say so in words rather than the schema's type error.
    errors[key] ??= issue.path.length === 1 && body[key] === undefined && issue.code === "invalid_type" ? "fill this in: it is required" : issue.message;
  }
  return errors;
}

/** The capture time an entry carries as the record's time (the dive's day has no clock time: the device's now). */
export function recordTimeOf(kind: EntryKind, body: Record<string, unknown>): string | undefined {
  const field = { dive: undefined, reading: "takenAt", find: "foundAt", sighting: "seenAt", "tube-fill": undefined, "tube-status": undefined }[kind];
  return field ? (body[field] as string | undefined) : undefined;
}

/** One line naming the entry in the queue. */
export function summaryOf(kind: EntryKind, body: Record<string, unknown>, snapshot: FieldSnapshot, form: FormValues = {}): string {
  switch (kind) {
    case "dive": {
      const team = snapshot.teams.find((candidate) => candidate.id === body.team)?.name ?? body.team;
      return `Dive · ${body.diver ?? "?"} (${team ?? "no team"}) · ${body.date} · ${(body.cells as string[]).join(" ")} · ${body.maxDepth ?? "?"} ${snapshot.project.lengthLabel}`;
    }
    case "reading": {
      const station = snapshot.stations.find((candidate) => candidate.id === body.station)?.name ?? body.station;
      return `Reading · ${station} · ${body.value} ${body.unit}`;
    }
    case "find":
      return `Find · ${FIND_CATEGORY_LABELS[body.category as FindCategory] ?? body.category} · ${String(body.description ?? "").slice(0, 60)}${body.cell ? ` · ${body.cell}` : ""}`;
    case "sighting":
      return `Sighting · ${body.species}${body.gone ? " · gone" : body.distance != null ? ` · ${body.distance} ${snapshot.project.lengthLabel}` : ""}`;
    case "tube-fill": {
      const tube = snapshot.tubes.find((candidate) => String(candidate.id) === form.tube);
      return `Tube fill · ${tube?.name ?? form.tube} · ${body.date} · ${body.drySolids} ${snapshot.massLabel} dry solids`;
    }
    case "tube-status": {
      const tube = snapshot.tubes.find((candidate) => String(candidate.id) === form.tube);
      return `Tube ${tube?.name ?? form.tube} · ${tube?.status ?? "?"} → ${body.status}`;
    }
  }
}
