import type { z } from "zod";
import { CUSTODY_PURPOSE_LABELS, FIND_CATEGORY_LABELS, FIND_STATUS_LABELS, type CustodyPurpose, type FindCategory, type FindStatus } from "../../../shared/finds/finds";
import { CAKE_SOLIDS_MISSING, cakeSolidsInForce } from "../../../shared/dewatering/haul";
import { localDayOf } from "../../../shared/local-time";
import {
  custodyInputSchema, diveInputSchema, fillInputSchema, findInputSchema, haulInputSchema, jarTestInputSchema, readingInputSchema, shiftInputSchema, sightingInputSchema,
  statusInputSchema, tubeStatusSchema,
} from "~/lib/field-records/inputs";
import type { FieldSnapshot } from "~/models/field-snapshot";
import { ENTRY_LABELS, fieldOf, jarRowsOf, MAX_JARS, type FormValues } from "./entry-fields";
import type { EntryKind } from "./store";

export { ENTRY_LABELS, fieldOf, findTargetOf, jarRowsOf, MAX_JARS, type FormValues } from "./entry-fields";

/**
 * The field entries the page takes offline: what each form holds, the API body it becomes, and the
 * check with the server's own schema, so an entry the server would refuse is never queued.
 */


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
      return {
        station: snapshot.stations.length === 1 ? String(snapshot.stations[0].id) : "", takenAt: at, value: "", unit: "NTU", sampledBy: "", note: "",
        depth: "", instrument: "", calibratedAt: "", ph: "", dissolvedOxygen: "", temperature: "",
      };
    case "find":
      return { category: "", description: "", cell: "", foundAt: at, count: "1", finder: "", fieldTag: "", depthBelowSurface: "" };
    case "sighting":
      return { species: "", seenAt: at, distance: "", gone: false, observer: "", note: "" };
    case "tube-fill":
      return { tube: snapshot.tubes.length === 1 ? String(snapshot.tubes[0].id) : "", date: localDayOf(now.getTime(), snapshot.project.timeZone), drySolids: "", slurryVolume: "", slurryUnit: "gal" };
    case "tube-status":
      return { tube: snapshot.tubes.length === 1 ? String(snapshot.tubes[0].id) : "", status: "" };
    case "find-status":
      return { find: "", status: "", accessionNumber: "", note: "" };
    case "custody":
      return { find: "", fromName: snapshot.user.name, toName: "", place: "", purpose: "", handedAt: at, receiverSignature: "", note: "" };
    case "shift": {
      const flowUnit = snapshot.dewatering?.flowUnit ?? "gpm";
      return {
        date: localDayOf(now.getTime(), snapshot.project.timeZone), start: "07:00", end: "15:00", pumpHours: "", flowMode: "meter", flowValue: "", flowUnit,
        totaliserStart: "", totaliserEnd: "", totaliserUnit: flowUnit === "gpm" ? "gal" : "m3", solidsMode: "cw", solidsPercent: "", slurrySg: "", solidsSg: "",
        polymerProduct: "", polymerLot: "", stockPercent: "", dose: "", notes: "",
        ...Object.fromEntries(snapshot.tubes.map((tube) => [`tube:${tube.name}`, false])),
      };
    }
    case "jar-test": {
      const jars = Object.fromEntries(Array.from({ length: 4 }, (_, index) => [[`jar-${index}-dose`, ""], [`jar-${index}-ntu`, ""], [`jar-${index}-clarity`, ""]]).flat());
      return {
        date: localDayOf(now.getTime(), snapshot.project.timeZone), time: `${pad(now.getHours())}:${pad(now.getMinutes())}`, sampleSource: "", polymerProduct: "", polymerLot: "",
        benchStockPercent: "0.1", jarVolumeMl: "1000", rawNtu: "", settlingMinutes: "10", jarCount: "4", ...jars, chosenDose: "", notes: "",
      };
    }
    case "haul":
      return {
        date: localDayOf(now.getTime(), snapshot.project.timeZone), ticketNumber: "", truck: "", site: snapshot.dewatering?.haulSites.length === 1 ? String(snapshot.dewatering.haulSites[0].id) : "",
        loadValue: "", loadUnit: snapshot.dewatering?.flowUnit === "m3/h" ? "t" : "short-ton", cakeSolidsPercent: "", notes: "",
      };
  }
}

/** A percent field as a share (20 → 0.2); what was typed when it is not a number, so the schema names it. */
const share = (form: FormValues, name: string) => {
  const value = number(form, name);
  return typeof value === "number" ? value / 100 : value;
};

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
      // The optional figures are absent from entries queued before the form had them: sent as null.
      return {
        station: idOrName(form, "station"), takenAt: instantOf(form.takenAt), value: number(form, "value"), unit: text(form, "unit"), sampledBy: text(form, "sampledBy") ?? null, note: text(form, "note") ?? null,
        depth: number(form, "depth") ?? null, instrument: text(form, "instrument") ?? null, calibratedAt: instantOf(form.calibratedAt) ?? null,
        ph: number(form, "ph") ?? null, dissolvedOxygen: number(form, "dissolvedOxygen") ?? null, temperature: number(form, "temperature") ?? null,
      };
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
    case "find-status":
      // The find is the address (finds/<id>), as is a handover's.
      return { status: text(form, "status"), accessionNumber: text(form, "accessionNumber") ?? null, note: text(form, "note") ?? null };
    case "custody":
      return {
        fromName: text(form, "fromName"), toName: text(form, "toName"), place: text(form, "place"), purpose: text(form, "purpose"), handedAt: instantOf(form.handedAt),
        receiverSignature: text(form, "receiverSignature"), note: text(form, "note") ?? null,
      };
    case "shift": {
      const meter = form.flowMode !== "totaliser";
      const product = text(form, "polymerProduct");
      const polymerGiven = [product, text(form, "dose"), text(form, "stockPercent")].some((value) => value !== undefined);
      return {
        date: text(form, "date"), start: text(form, "start"), end: text(form, "end"), pumpHours: number(form, "pumpHours") ?? null,
        slurryFlow: meter ? { value: number(form, "flowValue"), unit: text(form, "flowUnit") } : null,
        totaliser: meter ? null : { start: number(form, "totaliserStart"), end: number(form, "totaliserEnd"), unit: text(form, "totaliserUnit") },
        solidsByWeight: form.solidsMode === "sg" ? null : share(form, "solidsPercent") ?? null,
        slurrySpecificGravity: form.solidsMode === "sg" ? number(form, "slurrySg") ?? null : null,
        solidsSpecificGravity: number(form, "solidsSg") ?? null,
        polymer: polymerGiven ? { product: product ?? "", lot: text(form, "polymerLot") ?? null, doseMgPerL: number(form, "dose"), stockPercent: number(form, "stockPercent") } : null,
        tubes: Object.keys(form).filter((key) => key.startsWith("tube:") && form[key] === true).map((key) => key.slice("tube:".length)),
        notes: text(form, "notes") ?? "",
      };
    }
    case "jar-test": {
      const raw = number(form, "rawNtu");
      return {
        date: text(form, "date"), time: text(form, "time") ?? null, sampleSource: text(form, "sampleSource") ?? "",
        polymer: { product: text(form, "polymerProduct") ?? "", lot: text(form, "polymerLot") ?? null, benchStockPercent: number(form, "benchStockPercent") },
        jarVolumeMl: number(form, "jarVolumeMl"), raw: raw === undefined ? null : { turbidityNtu: raw },
        jars: jarRowsOf(form).map((index) => ({
          doseMgPerL: number(form, `jar-${index}-dose`), settlingMinutes: number(form, "settlingMinutes"), turbidityNtu: number(form, `jar-${index}-ntu`) ?? null, clarity: text(form, `jar-${index}-clarity`),
        })),
        chosenDoseMgPerL: number(form, "chosenDose") ?? null, notes: text(form, "notes") ?? "",
      };
    }
    case "haul":
      return {
        date: text(form, "date"), ticketNumber: text(form, "ticketNumber"), truck: text(form, "truck"), site: idOrName(form, "site"),
        load: { value: number(form, "loadValue"), unit: text(form, "loadUnit") }, cakeSolidsByWeight: share(form, "cakeSolidsPercent") ?? null, notes: text(form, "notes") ?? "",
      };
  }
}

const SCHEMAS: Record<EntryKind, z.ZodType> = {
  dive: diveInputSchema, reading: readingInputSchema, find: findInputSchema, "find-status": statusInputSchema, custody: custodyInputSchema, sighting: sightingInputSchema,
  "tube-fill": fillInputSchema, "tube-status": tubeStatusSchema, shift: shiftInputSchema, "jar-test": jarTestInputSchema, haul: haulInputSchema,
};

/**
 * The server's own check, run on the device: errors per form field (first message each). Beside the
 * schemas, the rules the server applies with the project's settings, from the same shared functions
 * (a ticket's cake solids: its own or the project's default, cakeSolidsInForce).
 */
export function checkBody(kind: EntryKind, body: Record<string, unknown>, form: FormValues, snapshot: Pick<FieldSnapshot, "dewatering">): Record<string, string> {
  const result = SCHEMAS[kind].safeParse(body);
  const errors: Record<string, string> = {};
  if (kind === "haul" && body.cakeSolidsByWeight == null && cakeSolidsInForce(null, snapshot.dewatering?.cakeSolidsByWeight) === null) errors.cakeSolidsPercent = CAKE_SOLIDS_MISSING;
  if ((kind === "tube-status" || kind === "tube-fill") && !text(form, "tube")) errors.tube = "choose the tube";
  if ((kind === "find-status" || kind === "custody") && !text(form, "find")) errors.find = "choose the find";
  if (kind === "dive" && body.team === undefined) errors.team = "choose the team";
  if (kind === "haul" && body.site === undefined) errors.site = "choose the destination";
  if (result.success) return errors;
  for (const issue of result.error.issues) {
    const key = fieldOf(kind, issue.path, form);
    const value = issue.path.reduce<unknown>((at, part) => (at && typeof at === "object" ? (at as Record<PropertyKey, unknown>)[part] : undefined), body);
    // A field left empty is absent from the body: say so in words rather than the schema's type error.
    errors[key] ??= issue.path.length > 0 && value === undefined && issue.code === "invalid_type" ? "fill this in: it is required" : issue.message;
  }
  return errors;
}

/** The capture time an entry carries as the record's time (the dive's day has no clock time: the device's now). */
export function recordTimeOf(kind: EntryKind, body: Record<string, unknown>): string | undefined {
  const field = { reading: "takenAt", find: "foundAt", sighting: "seenAt", custody: "handedAt" }[kind as string];
  return field ? (body[field] as string | undefined) : undefined;
}

/** One line naming the entry in the queue. */
export function summaryOf(kind: EntryKind, body: Record<string, unknown>, snapshot: FieldSnapshot, form: FormValues = {}, findLabel?: string): string {
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
    case "find-status": {
      const find = snapshot.finds.find((candidate) => String(candidate.id) === form.find);
      return `Find ${find?.catalogueNumber ?? form.find} · ${FIND_STATUS_LABELS[find?.status as FindStatus] ?? find?.status ?? "?"} → ${FIND_STATUS_LABELS[body.status as FindStatus] ?? body.status}`;
    }
    case "custody":
      return `Handover · ${findLabel ?? form.find} · ${body.fromName} → ${body.toName} · ${CUSTODY_PURPOSE_LABELS[body.purpose as CustodyPurpose] ?? body.purpose}`;
    case "shift": {
      const flow = body.slurryFlow as { value: number; unit: string } | null;
      return `Shift · ${body.date} ${body.start}–${body.end} · ${flow ? `${flow.value} ${flow.unit === "m3/h" ? "m³/h" : flow.unit}` : "totaliser"}`;
    }
    case "jar-test":
      return `Jar test · ${body.date}${body.time ? ` ${body.time}` : ""} · ${(body.polymer as { product?: string }).product} · ${(body.jars as unknown[]).length} jars`;
    case "haul": {
      const site = snapshot.dewatering?.haulSites.find((candidate) => candidate.id === body.site)?.name ?? body.site;
      const load = body.load as { value: number; unit: string };
      const unit = { "short-ton": "short tons wet", t: "t wet", yd3: "yd³", m3: "m³" }[load.unit] ?? load.unit;
      return `Haul ticket ${body.ticketNumber} · ${body.truck} → ${site} · ${load.value} ${unit}`;
    }
  }
}
