import { describe, expect, it } from "vitest";
import type { FieldSnapshot } from "~/models/field-snapshot";
import { blankForm, bodyOf, checkBody, deviceIso, fieldOf, findTargetOf, type FormValues } from "./entries";

const snapshot: FieldSnapshot = {
  user: { id: 5, name: "Maya Field" },
  project: { id: 1, name: "Test spring", timeZone: "America/New_York", lengthUnit: "us-ft", lengthLabel: "ftUS" },
  may: { dives: true, readings: true, finds: true, sightings: true, tubes: true },
  teams: [{ id: 7, name: "Team A", divers: ["Ana Diver"] }],
  stations: [{ id: 3, name: "CP-1", kind: "compliance" }],
  tubes: [{ id: 4, name: "T-1", status: "filling", version: "v1", fillLevel: 0.2 }],
  massLabel: "short tons",
  dewatering: { solidsSpecificGravity: 2.6, cakeSolidsByWeight: 0.3, flowUnit: "gpm", haulSites: [{ id: 9, name: "North farm", kind: "reuse" }] },
  finds: [{ id: 11, catalogueNumber: "TS-2026-0011", category: "modern-debris", description: "a can", status: "in-field", foundAt: "2026-12-01T15:00:00.000Z", currentHolder: { name: "Ana", place: "in the field" }, version: "f1" }],
  cells: ["A1"],
  heldCells: [],
  species: ["manatee"],
  stoppages: { stopWork: [], standDowns: [], nowMs: 0, timeZone: "America/New_York" },
  takenAt: "2026-12-03T12:00:00.000Z",
};

describe("deviceIso", () => {
  it("writes the device's clock with its own offset, naming the same instant (computed: offset from Date#getTimezoneOffset)", () => {
    const instant = new Date(Date.UTC(2026, 11, 3, 15, 42, 5));
    const written = deviceIso(instant);
    expect(written).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d[+-]\d\d:\d\d$/);
    expect(Date.parse(written)).toBe(instant.getTime());
  });
});

describe("bodyOf and checkBody: the device refuses what the server's schema refuses", () => {
  it("a complete reading passes the server's schema, its time kept with the device's offset", () => {
    const form: FormValues = { ...blankForm("reading", snapshot, new Date(Date.UTC(2026, 11, 3, 15, 0))), value: "4.2" };
    const body = bodyOf("reading", form);
    expect(body.station).toBe(3);
    expect(Date.parse(String(body.takenAt))).toBe(new Date(String(form.takenAt)).getTime());
    expect(checkBody("reading", body, {}, snapshot)).toEqual({});
  });

  it("a reading's depth, instrument, calibration check, pH, DO and temperature go in the body, and a pH of 15 is refused on its field", () => {
    const form: FormValues = {
      ...blankForm("reading", snapshot, new Date(Date.UTC(2026, 11, 3, 15, 0))), value: "4.2", depth: "3,5", instrument: "Turbidimeter T-2", calibratedAt: "2026-12-03T06:30",
      ph: "7.4", dissolvedOxygen: "6.1", temperature: "22.5",
    };
    const body = bodyOf("reading", form);
    expect(body).toMatchObject({ depth: 3.5, instrument: "Turbidimeter T-2", ph: 7.4, dissolvedOxygen: 6.1, temperature: 22.5 });
    expect(Date.parse(String(body.calibratedAt))).toBe(new Date("2026-12-03T06:30").getTime());
    expect(checkBody("reading", body, {}, snapshot)).toEqual({});
    expect(checkBody("reading", bodyOf("reading", { ...form, ph: "15" }), {}, snapshot)).toEqual({ ph: "pH is between 0 and 14" });
    // An entry queued before the form had these fields sends them as null.
    expect(bodyOf("reading", { station: "3", takenAt: "2026-12-03T10:00", value: "4", unit: "NTU" })).toMatchObject({ depth: null, instrument: null, calibratedAt: null, ph: null });
  });

  it("a negative turbidity is refused with the server's words, by field (practice: the schema's message)", () => {
    const body = bodyOf("reading", { ...blankForm("reading", snapshot, new Date()), value: "-1" });
    expect(checkBody("reading", body, {}, snapshot)).toEqual({ value: "turbidity is 0 NTU or more" });
  });

  it("a number field holding words is refused, not read as empty", () => {
    const body = bodyOf("reading", { ...blankForm("reading", snapshot, new Date()), value: "four" });
    expect(Object.keys(checkBody("reading", body, {}, snapshot))).toEqual(["value"]);
  });

  it("empty required fields say they are required; a dive without a team or cells is refused", () => {
    const form = blankForm("dive", snapshot, new Date());
    const errors = checkBody("dive", bodyOf("dive", { ...form, team: "" }), { ...form, team: "" }, snapshot);
    expect(errors.team).toBe("choose the team");
    expect(errors.maxDepth).toBe("fill this in: it is required");
    expect(errors.cells).toBe("name at least one cell the dive worked");
  });

  it("a dive's cells are read from a typed list, upper-cased as the grid labels them", () => {
    const body = bodyOf("dive", { ...blankForm("dive", snapshot, new Date()), diver: "Ana Diver", bottomMinutes: "30", maxDepth: "6,5", cells: "a1, b2  c3" });
    expect(body.cells).toEqual(["A1", "B2", "C3"]);
    expect(body.maxDepth).toBe(6.5);
    expect(checkBody("dive", body, {}, snapshot)).toEqual({});
  });

  it("a sighting needs a distance unless the animal is gone (the server's refinement)", () => {
    const form = { ...blankForm("sighting", snapshot, new Date()), species: "manatee", observer: "Ana" };
    expect(checkBody("sighting", bodyOf("sighting", form), {}, snapshot)).toHaveProperty("distance");
    expect(checkBody("sighting", bodyOf("sighting", { ...form, gone: true }), {}, snapshot)).toEqual({});
  });

  it("a tube fill: dry solids and an optional metered slurry volume, as the server's schema reads them", () => {
    const form: FormValues = { ...blankForm("tube-fill", snapshot, new Date()), drySolids: "2.5" };
    expect(form.tube).toBe("4");
    const body = bodyOf("tube-fill", form);
    expect(body).toMatchObject({ drySolids: 2.5, slurryVolume: null });
    expect(checkBody("tube-fill", body, form, snapshot)).toEqual({});
    const metered = bodyOf("tube-fill", { ...form, slurryVolume: "1200", slurryUnit: "gal" });
    expect(metered.slurryVolume).toEqual({ value: 1200, unit: "gal" });
    expect(checkBody("tube-fill", bodyOf("tube-fill", { ...form, drySolids: "0" }), form, snapshot)).toEqual({ drySolids: "the dry solids are more than 0" });
    expect(checkBody("tube-fill", body, { ...form, tube: "" }, snapshot)).toEqual({ tube: "choose the tube" });
  });
});

describe("the dewatering entries and handovers", () => {
  it("a shift by flow meter: percent solids become a share, ticked tubes their names; the server's schema passes it", () => {
    const form: FormValues = { ...blankForm("shift", snapshot, new Date()), flowValue: "900", solidsPercent: "12", "tube:T-1": true };
    const body = bodyOf("shift", form);
    expect(body).toMatchObject({ start: "07:00", end: "15:00", slurryFlow: { value: 900, unit: "gpm" }, totaliser: null, solidsByWeight: 0.12, polymer: null, tubes: ["T-1"] });
    expect(checkBody("shift", body, form, snapshot)).toEqual({});
  });

  it("a shift's refusals land on the form's own fields (the body nests the flow and the polymer)", () => {
    const form: FormValues = { ...blankForm("shift", snapshot, new Date()), flowMode: "totaliser", totaliserStart: "500", totaliserEnd: "400", polymerProduct: "PAM-x", stockPercent: "0.5" };
    // The schema's cross-field rules run once every field reads: first the missing dose, then the totaliser.
    expect(checkBody("shift", bodyOf("shift", form), form, snapshot)).toEqual({ dose: "fill this in: it is required" });
    const dosed = { ...form, dose: "15" };
    expect(checkBody("shift", bodyOf("shift", dosed), dosed, snapshot)).toEqual({ totaliserEnd: "the totaliser reads more at the end of the shift than at its start" });
    expect(fieldOf("shift", ["slurryFlow", "value"])).toBe("flowValue");
  });

  it("a haul ticket: the site by id, the load with its unit, cake solids as a share", () => {
    const form: FormValues = { ...blankForm("haul", snapshot, new Date()), ticketNumber: "T-100", truck: "Truck 4", loadValue: "14.5", cakeSolidsPercent: "28" };
    expect(form.site).toBe("9");
    const body = bodyOf("haul", form);
    expect(body).toMatchObject({ site: 9, load: { value: 14.5, unit: "short-ton" }, cakeSolidsByWeight: 0.28 });
    expect(checkBody("haul", body, form, snapshot)).toEqual({});
    expect(checkBody("haul", bodyOf("haul", { ...form, loadValue: "" }), form, snapshot)).toEqual({ loadValue: "fill this in: it is required" });
  });

  it("a haul ticket with no cake solids of its own: counted at the project's default, refused on the device when the project has none (the server's rule, cakeSolidsInForce)", () => {
    const form: FormValues = { ...blankForm("haul", snapshot, new Date()), ticketNumber: "T-101", truck: "Truck 4", loadValue: "14.5" };
    const body = bodyOf("haul", form);
    expect(body.cakeSolidsByWeight).toBeNull();
    expect(checkBody("haul", body, form, snapshot)).toEqual({});
    const noDefault = { dewatering: { ...snapshot.dewatering!, cakeSolidsByWeight: null } };
    expect(checkBody("haul", body, form, noDefault)).toEqual({ cakeSolidsPercent: "Give the load's cake solids: the project has no default cake solids yet." });
    const sampled = { ...form, cakeSolidsPercent: "31" };
    expect(checkBody("haul", bodyOf("haul", sampled), sampled, noDefault)).toEqual({});
    // The range is still the schema's: 0 % is no cake.
    const zero = { ...form, cakeSolidsPercent: "0" };
    expect(checkBody("haul", bodyOf("haul", zero), zero, noDefault)).toEqual({ cakeSolidsPercent: "cake solids are a share above 0" });
  });

  it("a jar test keeps the jar rows that hold anything; a jar's error names its row", () => {
    const form: FormValues = { ...blankForm("jar-test", snapshot, new Date()), polymerProduct: "PAM-x", "jar-1-dose": "5", "jar-1-clarity": "clear", "jar-3-dose": "-2", "jar-3-clarity": "hazy" };
    const body = bodyOf("jar-test", form);
    expect((body.jars as unknown[]).length).toBe(2);
    expect(checkBody("jar-test", body, form, snapshot)).toEqual({ "jar-3-dose": "the dose tried is more than 0 mg/L" });
  });

  it("a handover names a find the server has or one waiting in the queue; without one it is refused on the device", () => {
    expect(findTargetOf({ find: "11" })).toEqual({ findId: 11 });
    expect(findTargetOf({ find: "queued:abc-123" })).toEqual({ entryId: "abc-123" });
    const form: FormValues = { ...blankForm("custody", snapshot, new Date()), toName: "Lab courier", place: "State lab", purpose: "to-state-lab", receiverSignature: "Lab courier" };
    expect(form.fromName).toBe("Maya Field");
    expect(checkBody("custody", bodyOf("custody", form), form, snapshot)).toEqual({ find: "choose the find" });
    expect(checkBody("custody", bodyOf("custody", { ...form, find: "queued:abc-123" }), { ...form, find: "queued:abc-123" }, snapshot)).toEqual({});
  });

  it("a find's status: curated needs the lab's accession number (the server's refinement)", () => {
    const form: FormValues = { ...blankForm("find-status", snapshot, new Date()), find: "11", status: "curated" };
    expect(checkBody("find-status", bodyOf("find-status", form), form, snapshot)).toEqual({ accessionNumber: "a curated find carries the lab's accession number" });
  });
});
