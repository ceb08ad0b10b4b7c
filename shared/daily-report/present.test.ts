import { describe, expect, it } from "vitest";
import { byHandLine, dayState, dayStatus, earlierCountersignatureLine, enteredHeadCountsLine, equipmentRows, equipmentTotalsLine, findsLine, headCountCell, interruptionLine, lostHoursNote, productionRows, reportUnits, surveyLine, visitorRows, weatherLine } from "./present";

describe("the report's figures written out", () => {
  it("in a feet project's units: US gallons, short tons, pounds", () => {
    const units = reportUnits("us-ft");
    // published: 1 US gallon = 3.785411784 L (NIST Handbook 44); computed: 880 m³ ÷ 0.003785411784 m³ = 232,471.0 gal
    expect(units.slurry(880)).toBe("232,471 gal");
    // published: 1 short ton = 907.18474 kg; 1 lb = 0.45359237 kg (NIST)
    expect(units.bulk(10_100.4)).toBe("11.13 short tons");
    expect(units.mass(8.75)).toBe("19.3 lb");
  });

  it("in a metre project's units: cubic metres, tonnes, kilograms", () => {
    const units = reportUnits("m");
    expect(units.slurry(880.25)).toBe("880.3 m³");
    expect(units.bulk(17_850.5)).toBe("17.85 t");
    expect(units.mass(8.75)).toBe("8.75 kg");
  });

  it("lists the production figures in the page's order", () => {
    const rows = productionRows({ shifts: 2, pumpHours: 8.5, slurryPumpedM3: 880, drySolidsKg: 10_100.4, neatPolymerKg: 8.75, tubeFills: 1, haulLoads: 2, haulDrySolidsKg: 17_850.5, haulTickets: [] }, reportUnits("m"));
    expect(rows).toEqual([["Shifts", "2"], ["Pump hours", "8.5"], ["Slurry pumped", "880 m³"], ["Dry solids pumped", "10.1 t"], ["Neat polymer", "8.75 kg"], ["Tube fills", "1"], ["Haul loads", "2"], ["Dry solids hauled", "17.85 t"]]);
  });

  it("writes weather, finds and the survey in words, and nothing for what was not entered", () => {
    expect(weatherLine(null)).toBeNull();
    expect(weatherLine({ conditions: "", airTemperature: "", wind: "", rain: "", effect: "none" })).toBeNull();
    expect(weatherLine({ conditions: "Overcast", airTemperature: "18 °C", wind: "SW 10 kn", rain: "", effect: "" })).toBe("Overcast · 18 °C · wind SW 10 kn");
    expect(findsLine({})).toBeNull();
    expect(byHandLine(undefined, "us-ft")).toBeNull();
    // computed: 21.729 L ÷ 3.785411784 L/gal (NIST SP 811) = 5.740 gal
    expect(byHandLine({ lines: 3, items: 20, litres: 21.729 }, "us-ft")).toBe("Removed by hand in basket loads: 20 items counted, 5.7 gal by volume (3 catalogue lines)");
    expect(byHandLine({ lines: 1, items: 0, litres: 21.729 }, "m")).toBe("Removed by hand in basket loads: 21.7 L by volume (1 catalogue line)");
    expect(byHandLine({ lines: 1, items: 1, litres: null }, "m")).toBe("Removed by hand in basket loads: 1 item counted (1 catalogue line)");
    expect(findsLine({ cultural: 1, faunal: 2 })).toBe("Cultural: 1 · Faunal: 2");
    expect(surveyLine({ surveyedOn: "2026-06-10", since: "2026-05-27", removedVolume: 574.5, cellsReachedFirmSand: 1, remainingVolume: 3_867.6, volumeLabel: "yd³" }))
      .toBe("Survey of this day against the survey of 2026-05-27: 574.5 yd³ removed, 1 cell newly at firm sand, 3,867.6 yd³ remaining.");
    // The settings version the figures were computed with is named, so a signed report can be read against the history.
    expect(surveyLine({ surveyedOn: "2026-06-10", since: null, removedVolume: 0, cellsReachedFirmSand: 0, remainingVolume: 10, volumeLabel: "m³", settingsVersion: 3 }))
      .toBe("Survey of this day: 0 m³ removed, 0 cells newly at firm sand, 10 m³ remaining. Computed with settings version 3.");
  });
});

describe("a day's state: the latest of signed, countersigned and amended (practice: what the inspector has not yet seen comes first)", () => {
  const t = (hh: number, mm = 0) => Date.UTC(2026, 5, 10, hh, mm);
  const events = (signedAtMs: number | null, countersignedAtMs: number | null, amendedAtMs: number[] = []) => ({ signedAtMs, countersignedAtMs, amendedAtMs });

  it("no work, draft, signed", () => {
    expect(dayState(null, false)).toBe("no work");
    expect(dayState(null, true)).toBe("draft");
    expect(dayState(events(null, null), false)).toBe("draft");
    expect(dayStatus(events(t(18), null), true)).toEqual({ state: "signed", note: null });
  });

  it("signed, then countersigned: countersigned", () => {
    expect(dayStatus(events(t(18), t(19)), true)).toEqual({ state: "countersigned", note: null });
  });

  it("signed, amended, then countersigned: countersigned, the amendment shown beside it (the inspector countersigned the report with it)", () => {
    expect(dayStatus(events(t(18), t(20), [t(19)]), true)).toEqual({ state: "countersigned", note: "with 1 amendment" });
    expect(dayStatus(events(t(18), t(21), [t(19), t(20)]), true)).toEqual({ state: "countersigned", note: "with 2 amendments" });
  });

  it("signed, countersigned, then amended: amended, after the countersignature (the correction waits for the inspector)", () => {
    expect(dayStatus(events(t(18), t(19), [t(20)]), true)).toEqual({ state: "amended", note: "after countersignature" });
    // An amendment before and one after the countersignature: the later one decides.
    expect(dayStatus(events(t(18), t(19, 30), [t(19), t(21)]), true)).toEqual({ state: "amended", note: "after countersignature" });
  });

  it("signed and amended, never countersigned: amended", () => {
    expect(dayStatus(events(t(18), null, [t(19)]), true)).toEqual({ state: "amended", note: null });
  });

  it("a countersignature and an amendment in the same stored second: the amendment counts as later (never hidden)", () => {
    expect(dayState(events(t(18), t(19) + 200, [t(19) + 700]), true)).toBe("amended");
    expect(dayState(events(t(18), t(19) + 700, [t(19) + 200]), true)).toBe("amended");
    expect(dayState(events(t(18), t(19) + 1000, [t(19)]), true)).toBe("countersigned");
  });
});

describe("equipment and countersignature lines", () => {
  const equipment = [
    { name: "Suction pump 1", workingHours: 7.5, idleHours: 2.5, idleReason: "turbidity stop" },
    { name: "Booster pump", workingHours: 10, idleHours: 0, idleReason: "" },
    { name: "Work boat", workingHours: 0.25, idleHours: 9.75, idleReason: "outboard under repair" },
  ];

  it("writes equipment rows with '—' for a piece that was never idle, and the totals", () => {
    expect(equipmentRows(equipment)).toEqual([
      ["Suction pump 1", "7.5", "2.5", "turbidity stop"],
      ["Booster pump", "10", "0", "—"],
      ["Work boat", "0.25", "9.75", "outboard under repair"],
    ]);
    // computed: 7.5 + 10 + 0.25 = 17.75 h working; 2.5 + 0 + 9.75 = 12.25 h idle
    expect(equipmentTotalsLine(equipment)).toBe("3 pieces: 17.75 h working, 12.25 h idle");
    expect(equipmentTotalsLine([equipment[1]!])).toBe("1 piece: 10 h working, 0 h idle");
    expect(equipmentRows(undefined)).toEqual([]);
    expect(equipmentTotalsLine([])).toBeNull();
  });

  it("says which version an earlier countersignature was of", () => {
    const stamp = (iso: string) => iso.slice(0, 16).replace("T", " ");
    expect(earlierCountersignatureLine({ name: "Morgan Alvarez", email: "m@agency.example", at: "2026-06-10T19:05:00.000Z", amendments: 0 }, stamp))
      .toBe("Earlier countersignature: Morgan Alvarez, 2026-06-10 19:05 (link sent to m@agency.example), of the report as signed, before any amendment.");
    expect(earlierCountersignatureLine({ name: "Morgan Alvarez", email: "m@agency.example", at: "2026-06-10T19:05:00.000Z", amendments: 2 }, stamp)).toMatch(/of the report with its first 2 amendments\.$/);
    expect(earlierCountersignatureLine({ name: "M", email: "m@a.example", at: "2026-06-10T19:05:00.000Z", amendments: 1 }, stamp)).toMatch(/with its first amendment\.$/);
  });
});

describe("a stop-work's agency notice", () => {
  const TZ = "America/New_York";
  // 18:05Z is 14:05 EDT (UTC−4 in June).
  const base = { kind: "stop-work" as const, reason: "turbidity at C1", start: "2026-06-10T18:05:00.000Z", end: "2026-06-10T19:40:00.000Z", lostHours: 1.58 };

  it("says when, to whom and how the agency was told, or that it was not (with when it was due)", () => {
    expect(interruptionLine({ ...base, notifyBy: "2026-06-10T19:05:00.000Z", agencyNotified: { at: "2026-06-10T18:20:00.000Z", to: "District office", how: "telephone" } }, TZ))
      .toBe("Stop-work (turbidity at C1) from 14:05 to 15:40: 1.58 h lost on the day; agency notified at 14:20 (to District office, by telephone)");
    expect(interruptionLine({ ...base, notifyBy: "2026-06-10T19:05:00.000Z", agencyNotified: null }, TZ))
      .toBe("Stop-work (turbidity at C1) from 14:05 to 15:40: 1.58 h lost on the day; agency not notified (due by 15:05)");
    // Signed before the notice was kept: the line as it was.
    expect(interruptionLine(base, TZ)).toBe("Stop-work (turbidity at C1) from 14:05 to 15:40: 1.58 h lost on the day");
  });
});

describe("weather downtime, head counts and visitors written out", () => {
  const TZ = "America/New_York";

  it("names weather downtime with its local times; a spell to midnight ends at 24:00", () => {
    // 17:10Z is 13:10 EDT; 04:00Z the next day is local midnight.
    expect(interruptionLine({ kind: "weather", reason: "lightning within 10 miles", start: "2026-06-10T17:10:00.000Z", end: "2026-06-10T19:40:00.000Z", lostHours: 2.5 }, TZ))
      .toBe("Weather downtime (lightning within 10 miles) from 13:10 to 15:40: 2.5 h lost on the day");
    expect(interruptionLine({ kind: "weather", reason: "storm", start: "2026-06-11T00:00:00.000Z", end: "2026-06-11T04:00:00.000Z", lostHours: 4 }, TZ))
      .toBe("Weather downtime (storm) from 20:00 to 24:00: 4 h lost on the day");
  });

  it("says, when lines overlapped, that an hour counts once in the total", () => {
    const lines = [{ lostHours: 2 }, { lostHours: 2.5 }] as Parameters<typeof lostHoursNote>[0]["interruptions"];
    expect(lostHoursNote({ interruptions: lines, lostHours: 4.5 })).toBeNull();
    expect(lostHoursNote({ interruptions: lines, lostHours: 3.5 })).toBe("interruptions overlapped: an hour lost to two causes counts once; 4.5 h line by line");
  });

  it("shows an entered head count with the compiled one beside it", () => {
    const team = { team: "Alpha", headCount: 5, compiledHeadCount: 4, headCountSource: "dive log" as const, enteredHeadCount: { headCount: 5, reason: "two tenders" }, dives: 2, bottomMinutes: 80, maxDepth: 9, cells: [], flags: [] };
    expect(headCountCell(team)).toBe("5 entered");
    expect(headCountCell({ ...team, enteredHeadCount: null, headCount: 4 })).toBe("4");
    expect(headCountCell({ ...team, enteredHeadCount: null, headCount: null })).toBe("—");
    expect(enteredHeadCountsLine([team, { ...team, team: "Shore crew", compiledHeadCount: null, headCountSource: null, enteredHeadCount: { headCount: 2, reason: "" } }]))
      .toBe("Head counts entered: Alpha 4 from the dive log, entered 5 (two tenders); Shore crew none compiled, entered 2.");
    expect(enteredHeadCountsLine([{ ...team, enteredHeadCount: null }])).toBeNull();
  });

  it("gives the visitors' rows with a dash for what was not entered", () => {
    expect(visitorRows([{ arrived: "09:30", left: "", name: "Sam Okafor", organisation: "", purpose: "dredge tour" }])).toEqual([["09:30", "—", "Sam Okafor", "—", "dredge tour"]]);
    expect(visitorRows(undefined)).toEqual([]);
  });
});
