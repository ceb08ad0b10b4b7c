import { describe, expect, it } from "vitest";
import { byHandLine, dayState, findsLine, productionRows, reportUnits, surveyLine, weatherLine } from "./present";

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
  });
});

describe("a day's state (practice: an amendment is what a reader must see first)", () => {
  it("no work, draft, signed, countersigned, amended", () => {
    expect(dayState(null, false)).toBe("no work");
    expect(dayState(null, true)).toBe("draft");
    expect(dayState({ signed: false, countersigned: false, amendments: 0 }, false)).toBe("draft");
    expect(dayState({ signed: true, countersigned: false, amendments: 0 }, true)).toBe("signed");
    expect(dayState({ signed: true, countersigned: true, amendments: 0 }, true)).toBe("countersigned");
    expect(dayState({ signed: true, countersigned: true, amendments: 1 }, true)).toBe("amended");
  });
});
