import { describe, expect, it } from "vitest";
import { reconcileSolids } from "./reconciliation";
import { attributeSolidsToZones, type DiveForAttribution, type ShiftForAttribution } from "./zone-attribution";

// Checks of the zone attribution by hand: every figure below is worked out in the comment beside
// it from the rule in zone-attribution.ts (computed), and the rows must add up to the totals
// (invariant).

const shifts: ShiftForAttribution[] = [
  { date: "2026-11-10", start: "07:00", end: "11:00", drySolidsKg: 1000 }, // A: 240 min
  { date: "2026-11-10", start: "12:00", end: "16:00", drySolidsKg: 600 }, // B: 240 min
  { date: "2026-11-11", start: "07:00", end: "15:00", drySolidsKg: 400 }, // C: no dive that day
];
const dives: DiveForAttribution[] = [
  // 90 min, all in A, over a cell of zone 1 and one of zone 2: 45 min each.
  { date: "2026-11-10", leftSurface: "08:00", leftBottom: "09:30", bottomMinutes: 90, cellZones: [1, 2] },
  // 10:30–12:30: 30 min in A (to 11:00), none between the shifts, 30 min in B (from 12:00); zone 2.
  { date: "2026-11-10", leftSurface: "10:30", leftBottom: "12:30", bottomMinutes: 120, cellZones: [2] },
  // Bottom time only, 60 min: shared by the shifts' lengths (240 and 240), 30 min each; a cell in no zone.
  { date: "2026-11-10", leftSurface: null, leftBottom: null, bottomMinutes: 60, cellZones: [null] },
  // A day without a shift: its dive shares nothing.
  { date: "2026-11-12", leftSurface: "08:00", leftBottom: "09:00", bottomMinutes: 60, cellZones: [3] },
];

describe("pumped and hauled solids attributed to zones by the dive log", () => {
  const result = attributeSolidsToZones({ shifts, dives, hauledKg: 1000 });

  it("shares each shift's solids by the dive minutes in its hours (computed by hand)", () => {
    // A: zone 1 45 min, zone 2 45 + 30 = 75 min, no zone 30 min; of 150 min → 1000 × 45/150 = 300, × 75/150 = 500, × 30/150 = 200.
    // B: zone 2 30 min, no zone 30 min; of 60 min → 600 × 1/2 = 300 each.
    expect(result.pumpedKgByZone.get(1)).toBeCloseTo(300, 9);
    expect(result.pumpedKgByZone.get(2)).toBeCloseTo(800, 9);
    expect(result.pumpedKgByZone.get(null)).toBeCloseTo(500, 9);
    expect(result.pumpedKgByZone.has(3)).toBe(false);
    // C had no dive: its 400 kg are unattributed.
    expect(result.unattributedPumpedKg).toBeCloseTo(400, 9);
  });

  it("shares the hauled solids in the proportions of the pumped (computed: 1000 × 300/2000 = 150, …)", () => {
    expect(result.hauledKgByZone.get(1)).toBeCloseTo(150, 9);
    expect(result.hauledKgByZone.get(2)).toBeCloseTo(400, 9);
    expect(result.hauledKgByZone.get(null)).toBeCloseTo(250, 9);
    expect(result.unattributedHauledKg).toBeCloseTo(200, 9);
  });

  it("adds up to the pumped and hauled totals (invariant)", () => {
    const sum = (map: Map<number | null, number>) => [...map.values()].reduce((total, kg) => total + kg, 0);
    expect(sum(result.pumpedKgByZone) + result.unattributedPumpedKg).toBeCloseTo(2000, 9);
    expect(sum(result.hauledKgByZone) + result.unattributedHauledKg).toBeCloseTo(1000, 9);
  });

  it("counts only the dive minutes inside the shift's hours (negative control: the whole 120 min would give zone 2 more)", () => {
    // Only shift A and the 10:30–12:30 dive: its 30 min in A are all the dive time, so A goes wholly to zone 2.
    const clipped = attributeSolidsToZones({ shifts: [shifts[0]], dives: [dives[1]], hauledKg: 0 });
    expect(clipped.pumpedKgByZone.get(2)).toBeCloseTo(1000, 9);
    // A dive wholly outside the shift's hours attributes nothing.
    const outside = attributeSolidsToZones({ shifts: [shifts[0]], dives: [{ ...dives[0], leftSurface: "11:15", leftBottom: "11:50" }], hauledKg: 0 });
    expect(outside.pumpedKgByZone.size).toBe(0);
    expect(outside.unattributedPumpedKg).toBeCloseTo(1000, 9);
  });

  it("leaves a cell the grid does not place unattributed, in its share of the dive (computed: 800 × 30/60 = 400)", () => {
    const unplaced = attributeSolidsToZones({
      shifts: [{ date: "2026-11-13", start: "07:00", end: "09:00", drySolidsKg: 800 }],
      dives: [{ date: "2026-11-13", leftSurface: "07:00", leftBottom: "08:00", bottomMinutes: 60, cellZones: [1, undefined] }],
      hauledKg: 0,
    });
    expect(unplaced.pumpedKgByZone.get(1)).toBeCloseTo(400, 9);
    expect(unplaced.unattributedPumpedKg).toBeCloseTo(400, 9);
  });

  it("with nothing pumped, all that was hauled is unattributed; a shift without figures adds nothing", () => {
    const none = attributeSolidsToZones({ shifts: [{ date: "2026-11-10", start: "07:00", end: "11:00", drySolidsKg: null }], dives: [dives[0]], hauledKg: 500 });
    expect(none.unattributedPumpedKg).toBe(0);
    expect(none.hauledKgByZone.size).toBe(0);
    expect(none.unattributedHauledKg).toBe(500);
  });
});

describe("the reconciliation's zone rows with the attribution", () => {
  // A metre project: bulk masses in tonnes, so 1000 kg is 1 t (SI).
  const attribution = attributeSolidsToZones({ shifts, dives, hauledKg: 1000 });
  const zones = [
    { zoneId: 1, name: "Vent basin", removedVolume: 10 },
    { zoneId: null, name: "Unzoned", removedVolume: 2 },
  ];
  const samples = [{ zoneId: 1, dryBulkDensityKgPerM3: 100, totalNitrogenMgKg: 10_000, totalPhosphorusMgKg: 1_000 }];
  const result = reconcileSolids({ lengthUnit: "m", zones, samples, pumpedDryKg: 2000, hauledDryKg: 1000, attribution });

  it("gives each zone its attributed share, and a zone with no row here (zone 2) joins the unattributed (computed)", () => {
    expect(result.zones[0].dryMassPumped.value).toBeCloseTo(0.3, 9);
    expect(result.zones[1].dryMassPumped.value).toBeCloseTo(0.5, 9);
    // 400 kg of shift C + 800 kg of zone 2 = 1.2 t pumped; 200 + 400 kg = 0.6 t hauled.
    expect(result.unattributed.dryMassPumped.value).toBeCloseTo(1.2, 9);
    expect(result.unattributed.dryMassHauled.value).toBeCloseTo(0.6, 9);
  });

  it("compares a zone's pumped share with its surveyed dry mass (computed: 10 m³ × 100 kg/m³ = 1 t; 0.3 t is −70 %)", () => {
    expect(result.zones[0].dryMassFromSurveys!.value).toBeCloseTo(1, 9);
    expect(result.zones[0].pumpedVersusSurveyedPercent).toBeCloseTo(-70, 9);
  });

  it("its rows add up to the project's pumped and hauled figures (invariant)", () => {
    const pumped = result.zones.reduce((sum, zone) => sum + zone.dryMassPumped.value, 0) + result.unattributed.dryMassPumped.value;
    const hauled = result.zones.reduce((sum, zone) => sum + zone.dryMassHauled.value, 0) + result.unattributed.dryMassHauled.value;
    expect(pumped).toBeCloseTo(result.project.dryMassPumped.value, 9);
    expect(hauled).toBeCloseTo(result.project.dryMassHauled.value, 9);
  });

  it("without an attribution everything pumped and hauled is unattributed, and the rule is stated", () => {
    const plain = reconcileSolids({ lengthUnit: "m", zones, samples, pumpedDryKg: 2000, hauledDryKg: 1000 });
    expect(plain.zones.every((zone) => zone.dryMassPumped.value === 0 && zone.dryMassHauled.value === 0)).toBe(true);
    expect(plain.unattributed.dryMassPumped.value).toBeCloseTo(2, 9);
    // With nothing placed, no zone says "−100 %".
    expect(plain.zones.map((zone) => zone.pumpedVersusSurveyedPercent)).toEqual([null, null]);
    expect(plain.assumptions).toContain(plain.attribution.rule);
  });
});
