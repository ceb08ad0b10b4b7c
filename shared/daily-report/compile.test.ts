import { describe, expect, it } from "vitest";
import { instantOfLocal } from "../local-time";
import { byCell, COMPLIANCE_STATION_SETTING, compileDay, localDayBounds, M3_PER_US_GALLON, type DayRecords } from "./compile";

const TZ = "America/New_York";
const at = (day: string, hh: number, mm = 0) => instantOfLocal(day, hh * 60 + mm, TZ);

function records(overrides: Partial<DayRecords> = {}): DayRecords {
  return {
    date: "2031-06-10",
    timeZone: TZ,
    nowMs: at("2031-06-12", 9),
    dives: [
      { team: "Alpha", diver: "R. Ode", bottomMinutes: 45, maxDepth: 12, cells: ["B3", "B4"], beyondNoDecompression: false },
      { team: "Alpha", diver: "J. Lin", visitor: true, bottomMinutes: 30, maxDepth: 14.5, cells: ["B4"], beyondNoDecompression: false },
      { team: "Bravo", diver: "K. Moss", bottomMinutes: 200, maxDepth: 40, cells: ["C1"], beyondNoDecompression: true },
    ],
    plannedTeams: [{ team: "Alpha", headCount: 4 }, { team: "Bravo", headCount: 3 }],
    shifts: [
      { pumpHours: 6, slurryFlow: { value: 500, unit: "gpm" }, drySolidsKg: 12_000, neatPolymerKg: 14.5 },
      { pumpHours: 2.5, slurryFlow: { value: 100, unit: "m3/h" }, drySolidsKg: null, neatPolymerKg: 3.25 },
    ],
    tubeFills: 3,
    hauls: [
      { ticketNumber: "T-2", drySolidsKg: 8000, loadWetMass: 20, loadVolume: null },
      { ticketNumber: "T-1", drySolidsKg: 7500.5, loadWetMass: 19, loadVolume: null },
    ],
    complianceStations: ["C1", "C2"],
    readings: [
      { station: "C1", stationKind: "compliance", takenAtMs: at("2031-06-10", 8), value: 12, unit: "NTU", exceeds: false },
      { station: "C1", stationKind: "compliance", takenAtMs: at("2031-06-10", 23, 30), value: 61, unit: "NTU", exceeds: true },
      { station: "BG", stationKind: "background", takenAtMs: at("2031-06-10", 8), value: 5, unit: "NTU", exceeds: null },
    ],
    sampling: { intervalMinutes: 360, workdayStartMinutes: 7 * 60, workdayEndMinutes: 19 * 60 },
    interruptions: [],
    finds: [
      { catalogueNumber: "FS-2031-002", category: "faunal" },
      { catalogueNumber: "FS-2031-001", category: "cultural" },
      { catalogueNumber: "FS-2031-003", category: "faunal" },
    ],
    holds: [
      { catalogueNumber: "FS-2031-001", placedAtMs: at("2031-06-10", 10), liftedAtMs: null },
      { catalogueNumber: "FS-2030-040", placedAtMs: at("2031-06-01", 10), liftedAtMs: at("2031-06-10", 23, 30) },
    ],
    entered: { weather: null, inspections: "", safety: "", notes: "" },
    ...overrides,
  };
}

describe("compileDay", () => {
  it("sums dives per team and for the day (hand-computed)", () => {
    const day = compileDay(records());
    // 45 + 30 + 200 = 275 minutes; deepest 40.
    expect(day.dives).toMatchObject({ count: 3, bottomMinutes: 275, maxDepth: 40 });
    expect(day.dives.flags).toHaveLength(1);
    // A depth in a flag carries the project's unit when it is given.
    expect(compileDay(records({ lengthLabel: "ftUS" })).dives.flags[0]).toBe("K. Moss: bottom time 200 min at 40 ftUS beyond the no-decompression figure");
    expect(day.teams.map((team) => [team.team, team.headCount, team.dives, team.bottomMinutes, team.maxDepth, team.cells])).toEqual([
      ["Alpha", 4, 2, 75, 14.5, ["B3", "B4"]],
      ["Bravo", 3, 1, 200, 40, ["C1"]],
    ]);
    expect(day.cells).toEqual(["B3", "B4", "C1"]);
    // Visitors are named per team (memory: the log marks J. Lin as a visitor above).
    expect(day.teams.map((team) => team.visitors)).toEqual([["J. Lin"], []]);
  });

  it("sums production from shifts and hauls", () => {
    const { production } = compileDay(records());
    // 500 gal/min × 60 min × 6 h = 180 000 gal = 681.374… m³; 100 m³/h × 2.5 h = 250 m³.
    expect(production.slurryPumpedM3).toBeCloseTo(180_000 * 0.003785411784 + 250, 1);
    expect(M3_PER_US_GALLON).toBeCloseTo(231 * 0.0254 ** 3, 12); // 231 in³, 1 in = 0.0254 m exactly
    expect(production).toMatchObject({ shifts: 2, pumpHours: 8.5, drySolidsKg: 12_000, neatPolymerKg: 17.75, tubeFills: 3, haulLoads: 2, haulDrySolidsKg: 15_500.5, haulTickets: ["T-1", "T-2"] });
  });

  it("gives each station its readings and verdict, and lists exceedances including one at 23:30 local", () => {
    const { waterQuality } = compileDay(records());
    const c1 = waterQuality.readings.find((row) => row.station === "C1")!;
    expect(c1).toMatchObject({ count: 2, maxValue: 61, exceeding: 1, withinLimit: 1, verdict: "exceeds" });
    expect(waterQuality.readings.find((row) => row.station === "BG")).toMatchObject({ count: 1, verdict: "not evaluated" });
    expect(waterQuality.readings.find((row) => row.station === "C2")).toMatchObject({ count: 0 });
    // 23:30 EDT (UTC−4) is 03:30 UTC the next day.
    expect(waterQuality.exceedances).toEqual([{ station: "C1", at: "2031-06-11T03:30:00.000Z", value: 61, unit: "NTU" }]);
    // Intervals 07–13 (08:00 reading) and 13–19 (none): one gap.
    expect(waterQuality.missedIntervals).toEqual([{ from: "2031-06-10T17:00:00.000Z", to: "2031-06-10T23:00:00.000Z" }]);
  });

  it("lists what is missing", () => {
    const day = compileDay(records());
    expect(day.missing).toEqual(["no weather entered", "no equipment hours entered", "compliance station C2 not sampled", "compliance not sampled 13:00–19:00"]);
    const idle = compileDay(records({ dives: [], shifts: [], entered: { weather: { conditions: "overcast", airTemperature: "", wind: "", rain: "", effect: "" }, inspections: "", safety: "", notes: "" } }));
    // No work logged: no sampling and no equipment hours are owed, but the missing dive log is said.
    expect(idle.missing).toEqual(["no dives logged"]);
  });

  it("a work day's equipment hours are entered fields like the weather: listed as missing until entered, kept as entered", () => {
    const equipment = [{ name: "Suction pump 1", workingHours: 7.5, idleHours: 2.5, idleReason: "turbidity stop" }];
    const day = compileDay(records({ entered: { weather: null, equipment, inspections: "", safety: "", notes: "" } }));
    expect(day.missing).not.toContain("no equipment hours entered");
    expect(day.entered.equipment).toEqual(equipment);
    // A shift without a dive is work too.
    expect(compileDay(records({ dives: [] })).missing).toContain("no equipment hours entered");
    // Notes saved before equipment hours were kept have no list: read as none.
    expect(compileDay(records({ entered: { weather: null, inspections: "", safety: "", notes: "" } })).missing).toContain("no equipment hours entered");
  });

  it("on a project with no compliance station: says so and where to set one up, never lists a sampling gap (practice: a gap needs a station to miss it)", () => {
    // Background readings only, a routine set, a worked day: before, the whole work day came out as gaps.
    const day = compileDay(records({ complianceStations: [], readings: [{ station: "BG", stationKind: "background", takenAtMs: at("2031-06-10", 8), value: 5, unit: "NTU", exceeds: null }] }));
    expect(day.waterQuality.missedIntervals).toEqual([]);
    expect(day.waterQuality.complianceStations).toEqual([]);
    expect(day.missing).toEqual(["no weather entered", "no equipment hours entered", `no compliance station set up, so sampling is not checked (a manager adds one under ${COMPLIANCE_STATION_SETTING})`]);
    expect(day.missing.join(" ")).not.toMatch(/not sampled/);
    expect(COMPLIANCE_STATION_SETTING).toBe("Water quality › Setup › Monitoring stations");
    // A day without work owes nothing, so nothing is said in the missing list.
    expect(compileDay(records({ complianceStations: [], readings: [], dives: [], shifts: [] })).missing).toEqual(["no weather entered", "no dives logged"]);
    // With a station the gaps are listed as before, and the stations named.
    expect(compileDay(records()).waterQuality.complianceStations).toEqual(["C1", "C2"]);
  });

  it("orders cells column then row, as the grid reads (D7 before D10, Z9 before AA1)", () => {
    expect(["D10", "AA1", "D7", "E2", "Z9", "D8"].sort(byCell)).toEqual(["D7", "D8", "D10", "E2", "Z9", "AA1"]);
    const day = compileDay(records({ dives: [{ team: "Alpha", diver: "R. Ode", bottomMinutes: 45, maxDepth: 12, cells: ["D10", "D7", "AA1"], beyondNoDecompression: false }] }));
    expect(day.cells).toEqual(["D7", "D10", "AA1"]);
    expect(day.teams[0]!.cells).toEqual(["D7", "D10", "AA1"]);
  });

  it("counts finds by category with catalogue numbers and holds placed and lifted on the day", () => {
    const day = compileDay(records());
    expect(day.finds).toEqual({ byCategory: { faunal: 2, cultural: 1 }, catalogueNumbers: ["FS-2031-001", "FS-2031-002", "FS-2031-003"] });
    expect(JSON.stringify(day.finds)).not.toMatch(/position|cell/i);
    expect(day.holds).toEqual({ placed: ["FS-2031-001"], lifted: ["FS-2030-040"] });
  });

  it("adds up the debris removed by hand from the day's basket lines, volumes in litres", () => {
    const day = compileDay(records({
      finds: [
        { catalogueNumber: "FS-2031-004", category: "modern-debris", basket: { count: 14, volume: { value: 2, unit: "gal" } } },
        { catalogueNumber: "FS-2031-005", category: "historic-debris", basket: { count: null, volume: { value: 0.5, unit: "ft3" } } },
        { catalogueNumber: "FS-2031-006", category: "faunal", basket: { count: 6, volume: null } },
        { catalogueNumber: "FS-2031-007", category: "cultural" },
      ],
    }));
    // published (NIST SP 811): 2 gal = 7.570823568 L, 0.5 ft³ = 14.158423296 L; computed sum 21.729 L
    expect(day.finds.byHand).toEqual({ lines: 3, items: 20, litres: 21.729 });
    expect(day.finds.byCategory).toEqual({ "modern-debris": 1, "historic-debris": 1, faunal: 1, cultural: 1 });
    // No basket load: no line at all (a report signed before keeps its shape).
    expect(compileDay(records()).finds.byHand).toBeUndefined();
  });

  it("clips interruptions to the local day and counts an open one until now", () => {
    const day = compileDay(records({
      interruptions: [
        // From 22:00 the day before to 02:30: 2.5 h fall on the day.
        { kind: "stand-down", reason: "manatee", startMs: at("2031-06-09", 22), endMs: at("2031-06-10", 2, 30) },
        // 23:30 to 01:00 the next day: 0.5 h on the day.
        { kind: "stop-work", reason: "C1", startMs: at("2031-06-10", 23, 30), endMs: at("2031-06-11", 1) },
        // Entirely the next day: not on this report.
        { kind: "stop-work", reason: "C1", startMs: at("2031-06-11", 9), endMs: null },
      ],
    }));
    expect(day.interruptions.map((event) => [event.kind, event.lostHours])).toEqual([["stand-down", 2.5], ["stop-work", 0.5]]);
    expect(day.lostHours).toBe(3);
    const open = compileDay(records({ date: "2031-06-11", nowMs: at("2031-06-11", 15), interruptions: [{ kind: "stop-work", reason: "C1", startMs: at("2031-06-11", 9), endMs: null, notifyByMs: at("2031-06-11", 10), agencyNotified: { atMs: at("2031-06-11", 9, 20), to: "District office", how: "telephone" } }] }));
    expect(open.interruptions[0]!.lostHours).toBe(6);
    // The agency's notice travels with the stop-work, as instants.
    expect(open.interruptions[0]).toMatchObject({ notifyBy: new Date(at("2031-06-11", 10)).toISOString(), agencyNotified: { at: new Date(at("2031-06-11", 9, 20)).toISOString(), to: "District office", how: "telephone" } });
  });

  it("lists weather downtime with the other interruptions; an hour lost to two causes counts once in the day's total", () => {
    const entered = { weather: { conditions: "thunderstorms", airTemperature: "", wind: "", rain: "", effect: "diving stopped for lightning" }, inspections: "", safety: "", notes: "" };
    const day = compileDay(records({
      interruptions: [{ kind: "stop-work", reason: "turbidity at C1", startMs: at("2031-06-10", 13), endMs: at("2031-06-10", 15) }],
      entered: { ...entered, weatherDowntime: [{ start: "14:00", end: "16:30", reason: "lightning within 10 miles" }, { start: "08:00", end: "08:45", reason: "fog on the open water" }] },
    }));
    expect(day.interruptions.map((event) => [event.kind, event.reason, event.lostHours])).toEqual([
      ["weather", "fog on the open water", 0.75], ["stop-work", "turbidity at C1", 2], ["weather", "lightning within 10 miles", 2.5],
    ]);
    // 14:00 EDT is 18:00 UTC.
    expect(day.interruptions[2]).toMatchObject({ start: "2031-06-10T18:00:00.000Z", end: "2031-06-10T20:30:00.000Z" });
    // computed by hand: 08:00–08:45 and 13:00–16:30 are lost, 0.75 + 3.5 = 4.25 h (2 + 2.5 + 0.75 = 5.25 line by line).
    expect(day.lostHours).toBe(4.25);
    // The downtime needs its effect on the work said; a blank effect is listed as missing.
    expect(day.missing).not.toContain("weather downtime entered, but not the weather's effect on the work");
    const silent = compileDay(records({ entered: { ...entered, weather: { ...entered.weather, effect: " " }, weatherDowntime: [{ start: "14:00", end: "16:30", reason: "lightning" }] } }));
    expect(silent.missing).toContain("weather downtime entered, but not the weather's effect on the work");
    // Stop-work and stand-down overlapping on their own are counted once too.
    const both = compileDay(records({ interruptions: [
      { kind: "stop-work", reason: "C1", startMs: at("2031-06-10", 9), endMs: at("2031-06-10", 12) },
      { kind: "stand-down", reason: "manatee", startMs: at("2031-06-10", 11), endMs: at("2031-06-10", 13) },
    ] }));
    expect(both.lostHours).toBe(4);
  });

  it("counts weather downtime in hours of time across the daylight-saving changes (23- and 25-hour days)", () => {
    const allDay = (date: string, start = "00:00", end = "24:00") => compileDay(records({ date, dives: [], nowMs: at("2031-12-01", 0), entered: { weather: null, inspections: "", safety: "", notes: "", weatherDowntime: [{ start, end, reason: "tropical storm" }] } }));
    // published (15 U.S.C. § 260a): 2031-11-02 is the first Sunday of November, 2031-03-09 the second Sunday of March.
    expect(allDay("2031-11-02").lostHours).toBe(25);
    expect(allDay("2031-03-09").lostHours).toBe(23);
    // 01:00–04:00 on the wall: the clocks skip 02:00–03:00, so 2 h; on the fall day 01:00 (first) to 04:00 is 4 h.
    expect(allDay("2031-03-09", "01:00", "04:00").lostHours).toBe(2);
    expect(allDay("2031-11-02", "01:00", "04:00").lostHours).toBe(4);
  });

  it("gives each team's head count from the day plan, else the dive log, and an entered count over either, the compiled one kept beside it", () => {
    const crews = [{ team: "Alpha", headCount: 5, reason: "a county tender joined" }, { team: "Shore crew", headCount: 2, reason: "" }];
    const day = compileDay(records({ plannedTeams: [{ team: "Alpha", headCount: 4 }], entered: { weather: null, inspections: "", safety: "", notes: "", crews } }));
    expect(day.teams.map((team) => [team.team, team.headCount, team.compiledHeadCount, team.headCountSource, team.enteredHeadCount])).toEqual([
      ["Alpha", 5, 4, "day plan", { headCount: 5, reason: "a county tender joined" }],
      // Bravo was not on the plan: K. Moss is the one diver its log names.
      ["Bravo", 1, 1, "dive log", null],
      // A crew with no plan and no dives, counted only as entered.
      ["Shore crew", 2, null, null, { headCount: 2, reason: "" }],
    ]);
    expect(day.missing).toContain("head count of team Bravo only from the dive log (1 diver): enter the crew on site");
    // Entered: the dive log's count is confirmed and the item goes.
    const confirmed = compileDay(records({ plannedTeams: [], entered: { weather: null, inspections: "", safety: "", notes: "", crews: [{ team: "Bravo", headCount: 3, reason: "" }, { team: "Alpha", headCount: 0, reason: "" }] } }));
    expect(confirmed.missing.filter((item) => item.startsWith("head count"))).toEqual([]);
    // Alpha's log names R. Ode and the visitor J. Lin: 2; entered 0 is a figure, not a blank.
    expect(confirmed.teams.find((team) => team.team === "Alpha")).toMatchObject({ headCount: 0, compiledHeadCount: 2, headCountSource: "dive log" });
  });

  it("asks for a visitor's time of leaving when it was not entered", () => {
    const visitors = [
      { arrived: "09:30", left: "11:00", name: "Morgan Alvarez", organisation: "District water agency", purpose: "silt curtain inspection" },
      { arrived: "13:15", left: "", name: "Sam Okafor", organisation: "", purpose: "" },
    ];
    const day = compileDay(records({ entered: { weather: null, inspections: "", safety: "", notes: "", visitors } }));
    expect(day.entered.visitors).toEqual(visitors);
    expect(day.missing).toContain("no time of leaving for Sam Okafor (arrived 13:15)");
    expect(day.missing.join(" ")).not.toContain("Morgan Alvarez");
  });

  it("takes a 23-hour local day across the spring daylight-saving change", () => {
    const { startMs, endMs } = localDayBounds("2031-03-09", TZ);
    expect((endMs - startMs) / 3_600_000).toBe(23);
    const day = compileDay(records({ date: "2031-03-09", nowMs: at("2031-03-12", 0), interruptions: [{ kind: "stand-down", reason: "manatee", startMs: at("2031-03-08", 12), endMs: null }] }));
    expect(day.interruptions[0]!.lostHours).toBe(23);
  });

  it("shows what a survey on the day found since the survey before it (hand-computed differences)", () => {
    const survey = {
      today: { surveyedOn: "2031-06-10", removedVolume: 2_480.4, remainingVolume: 3_867.6, cellsAtFirmSand: 61 },
      previous: { surveyedOn: "2031-05-27", removedVolume: 1_905.9, remainingVolume: 4_442.1, cellsAtFirmSand: 44 },
      volumeLabel: "yd³",
    };
    // computed by hand: 2,480.4 − 1,905.9 = 574.5 yd³; 61 − 44 = 17 cells
    expect(compileDay(records({ survey })).production.survey).toEqual({
      surveyedOn: "2031-06-10", since: "2031-05-27", removedVolume: 574.5, cellsReachedFirmSand: 17, remainingVolume: 3_867.6, volumeLabel: "yd³",
    });
    expect(compileDay(records()).production.survey).toBeNull();
  });
});
