import { describe, expect, it } from "vitest";
import type { FieldSnapshot } from "~/models/field-snapshot";
import { blankForm, bodyOf, checkBody, deviceIso, type FormValues } from "./entries";

const snapshot: FieldSnapshot = {
  project: { id: 1, name: "Test spring", timeZone: "America/New_York", lengthUnit: "us-ft", lengthLabel: "ftUS" },
  may: { dives: true, readings: true, finds: true, sightings: true, tubes: true },
  teams: [{ id: 7, name: "Team A", divers: ["Ana Diver"] }],
  stations: [{ id: 3, name: "CP-1", kind: "compliance" }],
  tubes: [{ id: 4, name: "T-1", status: "filling", version: "v1", fillLevel: 0.2 }],
  massLabel: "short tons",
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
    expect(checkBody("reading", body)).toEqual({});
  });

  it("a negative turbidity is refused with the server's words, by field (practice: the schema's message)", () => {
    const body = bodyOf("reading", { ...blankForm("reading", snapshot, new Date()), value: "-1" });
    expect(checkBody("reading", body)).toEqual({ value: "turbidity is 0 NTU or more" });
  });

  it("a number field holding words is refused, not read as empty", () => {
    const body = bodyOf("reading", { ...blankForm("reading", snapshot, new Date()), value: "four" });
    expect(Object.keys(checkBody("reading", body))).toEqual(["value"]);
  });

  it("empty required fields say they are required; a dive without a team or cells is refused", () => {
    const form = blankForm("dive", snapshot, new Date());
    const errors = checkBody("dive", bodyOf("dive", { ...form, team: "" }), { ...form, team: "" });
    expect(errors.team).toBe("choose the team");
    expect(errors.maxDepth).toBe("fill this in: it is required");
    expect(errors.cells).toBe("name at least one cell the dive worked");
  });

  it("a dive's cells are read from a typed list, upper-cased as the grid labels them", () => {
    const body = bodyOf("dive", { ...blankForm("dive", snapshot, new Date()), diver: "Ana Diver", bottomMinutes: "30", maxDepth: "6,5", cells: "a1, b2  c3" });
    expect(body.cells).toEqual(["A1", "B2", "C3"]);
    expect(body.maxDepth).toBe(6.5);
    expect(checkBody("dive", body)).toEqual({});
  });

  it("a sighting needs a distance unless the animal is gone (the server's refinement)", () => {
    const form = { ...blankForm("sighting", snapshot, new Date()), species: "manatee", observer: "Ana" };
    expect(checkBody("sighting", bodyOf("sighting", form))).toHaveProperty("distance");
    expect(checkBody("sighting", bodyOf("sighting", { ...form, gone: true }))).toEqual({});
  });

  it("a tube fill: dry solids and an optional metered slurry volume, as the server's schema reads them", () => {
    const form: FormValues = { ...blankForm("tube-fill", snapshot, new Date()), drySolids: "2.5" };
    expect(form.tube).toBe("4");
    const body = bodyOf("tube-fill", form);
    expect(body).toMatchObject({ drySolids: 2.5, slurryVolume: null });
    expect(checkBody("tube-fill", body, form)).toEqual({});
    const metered = bodyOf("tube-fill", { ...form, slurryVolume: "1200", slurryUnit: "gal" });
    expect(metered.slurryVolume).toEqual({ value: 1200, unit: "gal" });
    expect(checkBody("tube-fill", bodyOf("tube-fill", { ...form, drySolids: "0" }), form)).toEqual({ drySolids: "the dry solids are more than 0" });
    expect(checkBody("tube-fill", body, { ...form, tube: "" })).toEqual({ tube: "choose the tube" });
  });
});
