import { QUEUED_PREFIX, type EntryKind } from "./store";

/**
 * What the sender needs to know of the field entries without their schemas (so the service
 * worker's bundle carries no zod): each kind's name, the form field an error's path points at, the
 * find a handover names. entries.ts re-exports all of it.
 */

export type FormValues = Record<string, string | boolean>;

const text = (form: FormValues, name: string) => {
  const value = form[name];
  return typeof value === "string" && value.trim() !== "" ? value.trim() : undefined;
};

export const ENTRY_LABELS: Record<EntryKind, string> = {
  dive: "Dive log entry", reading: "Turbidity reading", find: "Find", "find-status": "Find status", custody: "Custody handover", sighting: "Wildlife sighting",
  "tube-fill": "Tube fill", "tube-status": "Tube status", shift: "Shift log", "jar-test": "Jar test", haul: "Haul ticket",
};

/** The most dosed jars one jar test takes (the server's schema). */
export const MAX_JARS = 8;

/** The jar rows of a jar test's form that hold anything, with their row numbers in the form. */
export function jarRowsOf(form: FormValues): number[] {
  const count = Math.min(MAX_JARS, Number(form.jarCount) || 0);
  return Array.from({ length: count }, (_, index) => index).filter((index) => ["dose", "ntu", "clarity"].some((part) => text(form, `jar-${index}-${part}`) !== undefined));
}

/**
 * The form field an error's path points at (the body's names differ from the form's where the body
 * nests: a shift's flow, a jar's dose, a ticket's load), so the message sits beside its input.
 */
export function fieldOf(kind: EntryKind, path: ReadonlyArray<PropertyKey>, form: FormValues = {}): string {
  const [first, second, third] = path.map(String);
  if (kind === "shift") {
    if (first === "slurryFlow") return "flowValue";
    if (first === "totaliser") return second === "start" ? "totaliserStart" : "totaliserEnd";
    if (first === "polymer") return second === "doseMgPerL" ? "dose" : second === "stockPercent" ? "stockPercent" : second === "lot" ? "polymerLot" : "polymerProduct";
    return { solidsByWeight: "solidsPercent", slurrySpecificGravity: "slurrySg", solidsSpecificGravity: "solidsSg" }[first] ?? first ?? "form";
  }
  if (kind === "jar-test") {
    if (first === "polymer") return second === "lot" ? "polymerLot" : second === "benchStockPercent" ? "benchStockPercent" : "polymerProduct";
    if (first === "raw") return "rawNtu";
    if (first === "jars") {
      if (second === undefined) return "jar-0-dose";
      const row = jarRowsOf(form)[Number(second)] ?? Number(second);
      return third === "settlingMinutes" ? "settlingMinutes" : `jar-${row}-${third === "clarity" ? "clarity" : third === "turbidityNtu" ? "ntu" : "dose"}`;
    }
    return { chosenDoseMgPerL: "chosenDose" }[first] ?? first ?? "form";
  }
  if (kind === "haul") return { load: "loadValue", cakeSolidsByWeight: "cakeSolidsPercent" }[first] ?? first ?? "form";
  return first ?? "form";
}

/** The find a handover or a status change names: a find the server has ("12") or one waiting in this device's queue ("queued:<id>"). */
export function findTargetOf(form: FormValues): { findId: number } | { entryId: string } | null {
  const value = text(form, "find");
  if (value === undefined) return null;
  if (value.startsWith(QUEUED_PREFIX)) return { entryId: value.slice(QUEUED_PREFIX.length) };
  return /^\d+$/.test(value) ? { findId: Number(value) } : null;
}
