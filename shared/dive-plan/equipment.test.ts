import { describe, expect, it } from "vitest";
import { DIAMETER_RANGE, MILLIMETRES_PER_INCH, convertDiameter, describeEquipment, describeNamed, diameterProblem, diameterUnitFor, equipmentIn, equipmentLine } from "./equipment";

describe("diameter units (published: the international inch is 25.4 mm exactly, NIST SP 811 (2008) appendix B)", () => {
  it("follow the project's length unit family: inches for either foot, millimetres for the metre", () => {
    expect([diameterUnitFor("us-ft"), diameterUnitFor("ft"), diameterUnitFor("m")]).toEqual(["in", "in", "mm"]);
  });

  it("convert both ways: 6 in is 152.4 mm, 100 mm is 3.937 in; a round trip returns the value", () => {
    expect(MILLIMETRES_PER_INCH).toBe(25.4);
    expect(convertDiameter(6, "in", "mm")).toBeCloseTo(152.4, 12);
    expect(convertDiameter(100, "mm", "in")).toBeCloseTo(3.937007874, 8);
    for (const value of [1, 4.5, 6, 12, 24]) expect(convertDiameter(convertDiameter(value, "in", "mm"), "mm", "in")).toBeCloseTo(value, 12);
    expect(convertDiameter(8, "in", "in")).toBe(8);
  });

  it("show an entry in the project's unit, rounded as trade sizes are written", () => {
    expect(equipmentIn({ name: "Hose A", diameter: 6, diameterUnit: "in" }, "mm")).toEqual({ name: "Hose A", diameter: 152, diameterUnit: "mm" });
    expect(equipmentIn({ name: "Hose B", diameter: 150, diameterUnit: "mm" }, "in")).toEqual({ name: "Hose B", diameter: 5.91, diameterUnit: "in" });
    expect(equipmentIn({ name: "Hose C", diameter: null, diameterUnit: "in" }, "mm")).toEqual({ name: "Hose C", diameter: null, diameterUnit: "mm" });
    expect(describeEquipment({ name: "Pump 1", diameter: 6, diameterUnit: "in" })).toBe("Pump 1 (6 in)");
    expect(describeEquipment({ name: "Hose D", diameter: null, diameterUnit: "in" })).toBe("Hose D");
  });
});

describe("plausible diameters (practice: diver-guided suction hoses run about 3–8 in, small dredge pumps up to about 12 in)", () => {
  it("accept the ends of the range and refuse just outside them, in both units", () => {
    for (const unit of ["in", "mm"] as const) {
      const { min, max } = DIAMETER_RANGE[unit];
      expect(diameterProblem(min, unit)).toBeNull();
      expect(diameterProblem(max, unit)).toBeNull();
      expect(diameterProblem(min * 0.99, unit)).toMatch(`must be from ${min} to ${max} ${unit}`);
      expect(diameterProblem(max * 1.01, unit)).toMatch(`must be from ${min} to ${max} ${unit}`);
    }
  });

  it("the two ranges are the same span within a millimetre (computed: 1 in = 25.4 mm, 24 in = 609.6 mm)", () => {
    expect(Math.abs(convertDiameter(DIAMETER_RANGE.in.min, "in", "mm") - DIAMETER_RANGE.mm.min)).toBeLessThan(1);
    expect(Math.abs(convertDiameter(DIAMETER_RANGE.in.max, "in", "mm") - DIAMETER_RANGE.mm.max)).toBeLessThan(1);
  });

  it("say when a diameter looks given in the other unit", () => {
    expect(diameterProblem(152, "in")).toBe("must be from 1 to 24 in (this project gives diameters in inches). Was it given in millimetres? 152 mm is 5.98 in.");
    expect(diameterProblem(6, "mm")).toBe("must be from 25 to 610 mm (this project gives diameters in millimetres). Was it given in inches? 6 in is 152.4 mm.");
    // Far outside either range: no guess.
    expect(diameterProblem(5000, "in")).toBe("must be from 1 to 24 in (this project gives diameters in inches).");
  });
});

describe("the equipment as plans and sheets write it", () => {
  const hoses = [{ name: "Hose A", diameter: 6, diameterUnit: "in" as const }, { name: "Hose B", diameter: null, diameterUnit: "in" as const }];
  it("names an assignment's hose with its diameter, or as written when the team no longer has it", () => {
    expect(describeNamed(hoses, "Hose A")).toBe("Hose A (6 in)");
    expect(describeNamed(hoses, "hose a")).toBe("hose a (6 in)");
    expect(describeNamed(hoses, "Hose B")).toBe("Hose B");
    expect(describeNamed(hoses, "Hose Z")).toBe("Hose Z");
  });
  it("lists hoses and pumps in one line, saying when there are none", () => {
    expect(equipmentLine(hoses, [{ name: "Pump 1", diameter: 150, diameterUnit: "mm" }])).toBe("Hoses: Hose A (6 in), Hose B. Pumps: Pump 1 (150 mm).");
    expect(equipmentLine([], [])).toBe("Hoses: none listed. Pumps: none listed.");
  });
});
