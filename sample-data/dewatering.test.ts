import { describe, expect, it } from "vitest";
import { computeShiftFigures } from "../shared/dewatering/shift";
import { kilogramsTo } from "../shared/units";
import { DEMO_CAKE_SOLIDS_BY_WEIGHT, DEMO_SOLIDS_SPECIFIC_GRAVITY, DEMO_TUBES, demoDewatering } from "./dewatering";
import { SURVEYS } from "./scenario";

// The demo's invented dewatering records hang together: the same seed gives the same records, no
// tube is filled past its capacity, the tickets haul out what the first tube held, and the work
// sits between the baseline and the closeout surveys.

const dryTonsOf = (shift: ReturnType<typeof demoDewatering>["shifts"][number]) =>
  kilogramsTo(computeShiftFigures({ ...shift, solidsSpecificGravity: DEMO_SOLIDS_SPECIFIC_GRAVITY }, "us-ft").drySolidsKg!, "short-ton");

describe("the demo's dewatering records", () => {
  it("are the same on every run (seeded)", () => {
    expect(demoDewatering()).toEqual(demoDewatering());
  });

  it("fill no tube past its capacity, and the tickets carry off what the first tube held, within 3 %", () => {
    const { shifts, hauls } = demoDewatering();
    const delivered = new Map<string, number>();
    for (const shift of shifts) for (const tube of shift.tubes) delivered.set(tube, (delivered.get(tube) ?? 0) + dryTonsOf(shift) / shift.tubes.length);
    for (const tube of DEMO_TUBES) expect(delivered.get(tube.name) ?? 0, tube.name).toBeLessThanOrEqual(tube.capacityDryMassPerLength * tube.length);
    const hauled = hauls.reduce((sum, haul) => sum + haul.load.value * (haul.cakeSolidsByWeight ?? DEMO_CAKE_SOLIDS_BY_WEIGHT), 0);
    expect(Math.abs(hauled / delivered.get("T-1")! - 1)).toBeLessThan(0.03);
    expect(new Set(hauls.map((haul) => haul.ticketNumber)).size).toBe(hauls.length);
  });

  it("lies between the baseline and the closeout survey", () => {
    const baseline = SURVEYS.find((survey) => survey.key === "baseline")!.surveyedOn;
    const closeout = SURVEYS.find((survey) => survey.key === "closeout")!.surveyedOn;
    const { shifts, hauls } = demoDewatering();
    for (const date of [...shifts, ...hauls].map((record) => record.date)) {
      expect(date > baseline && date < closeout, date).toBe(true);
    }
  });
});
