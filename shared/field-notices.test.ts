import { describe, expect, it } from "vitest";
import { findNotices, readingNotices, sightingNotices } from "./field-notices";
import { STAND_DOWN_CAUTION, WATER_QUALITY_CAUTION } from "./water-quality/wording";

// Source: practice — a safety notice is shown with the entry's answer, never dropped on sync.
describe("field notices", () => {
  it("say nothing for a reading within the limit, and the verdict, the stop-work and the caution for an exceedance", () => {
    expect(readingNotices({ verdict: "Within the limit.", exceeds: false })).toEqual([]);
    expect(readingNotices({ verdict: "Background reading.", exceeds: null })).toEqual([]);
    const notices = readingNotices({ verdict: "Exceeds: 41 NTU above background, the limit is 29.", exceeds: true, stopWork: { id: 7, notifyBy: "2026-11-21T14:00:00.000Z" } });
    expect(notices[0]).toBe("Exceeds: 41 NTU above background, the limit is 29.");
    expect(notices[1]).toMatch(/Stop-work event #7 is open.*2026-11-21T14:00:00.000Z/);
    expect(notices[2]).toBe(WATER_QUALITY_CAUTION);
  });

  it("name a stand-down running or ending, with the caution", () => {
    expect(sightingNotices("Manatee", undefined)).toEqual([]);
    expect(sightingNotices("Manatee", { id: 3, until: null })[0]).toMatch(/Stand-down #3 for Manatee applies.*left on its own/);
    expect(sightingNotices("Manatee", { id: 3, until: "2026-11-04T17:10:00.000Z" })).toEqual([expect.stringMatching(/until 2026-11-04T17:10:00.000Z/), STAND_DOWN_CAUTION]);
  });

  it("name a hold's cells", () => {
    expect(findNotices(undefined)).toEqual([]);
    expect(findNotices({ id: 2, cells: ["B7"] })[0]).toMatch(/Hold #2 stops work in cell B7:/);
    expect(findNotices({ id: 2, cells: ["B7", "C7"] })[0]).toMatch(/in 2 cells \(B7, C7\)/);
  });
});
