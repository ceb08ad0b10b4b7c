import { describe, expect, it } from "vitest";
import { evaluateTurbidity, percentRuleAllowance, verdictInWords, type TurbidityRule } from "./turbidity-rule";

const rule = (fields: Partial<TurbidityRule> & Pick<TurbidityRule, "kind">): TurbidityRule => ({ limitNtu: null, inclusive: true, percent: null, floorNtu: null, capNtu: null, ...fields });

// Florida surface-water turbidity criterion, 29 NTU above natural background, as restated in
// county technical specifications citing Rule 62-302.530, F.A.C. (published restatement; whether
// the limit itself is allowed is a rule setting, since the rule's own table was not seen).
const florida = (inclusive: boolean) => rule({ kind: "above-background", limitNtu: 29, inclusive });

describe("above background (29 NTU, Florida criterion restated citing F.A.C. 62-302.530)", () => {
  it("background 5, compliance 33: difference 28, within", () => {
    expect(evaluateTurbidity(florida(true), 33, 5)).toEqual({ paired: true, background: 5, difference: 28, limit: 34, exceeds: false });
  });
  it("background 5, compliance 34.5: exceeds", () => {
    expect(evaluateTurbidity(florida(true), 34.5, 5)).toMatchObject({ difference: 29.5, exceeds: true });
  });
  it("background 5, compliance 34.0: within when the limit is inclusive, exceeds when it is not", () => {
    expect(evaluateTurbidity(florida(true), 34.0, 5).exceeds).toBe(false);
    expect(evaluateTurbidity(florida(false), 34.0, 5).exceeds).toBe(true);
  });
  it("regression: 34.2 over 5.2 is exactly at the limit, not over it by binary rounding", () => {
    // 34.2 − 5.2 = 29.000000000000004 in doubles (computed).
    expect(34.2 - 5.2).not.toBe(29);
    expect(evaluateTurbidity(florida(true), 34.2, 5.2)).toMatchObject({ difference: 29, exceeds: false });
  });
  it("gives no verdict without a paired background", () => {
    expect(evaluateTurbidity(florida(true), 80, null)).toEqual({ paired: false, background: null, difference: null, limit: null, exceeds: null });
  });
});

describe("zero above background (Outstanding Florida Waters principle, F.A.C. 62-302.700: published principle)", () => {
  const zero = rule({ kind: "above-background", limitNtu: 0, inclusive: true });
  it("background 5, compliance 5.1: exceeds", () => {
    expect(evaluateTurbidity(zero, 5.1, 5).exceeds).toBe(true);
  });
  it("background 5, compliance 5: within (no increase); negative control", () => {
    expect(evaluateTurbidity(zero, 5, 5).exceeds).toBe(false);
    expect(evaluateTurbidity(zero, 4.8, 5).exceeds).toBe(false);
  });
});

// A state transportation department's borrow-pit specification (published): 25 NTU lakes,
// 10 NTU trout waters; "if background already exceeds the limit, the discharge must not increase it".
describe("absolute limits (borrow-pit specification: 25 NTU lakes, 10 NTU trout waters)", () => {
  const lake = rule({ kind: "absolute", limitNtu: 25 });
  const trout = rule({ kind: "absolute", limitNtu: 10 });
  it("judges against the limit itself", () => {
    expect(evaluateTurbidity(lake, 25, 3)).toMatchObject({ limit: 25, exceeds: false });
    expect(evaluateTurbidity(lake, 25.5, 3)).toMatchObject({ limit: 25, exceeds: true });
    expect(evaluateTurbidity(trout, 10, 2).exceeds).toBe(false);
    expect(evaluateTurbidity(trout, 11, 2).exceeds).toBe(true);
  });
  it("background 30 already above the lake limit: compliance 30 within, 31 exceeds", () => {
    expect(evaluateTurbidity(lake, 30, 30)).toMatchObject({ limit: 30, difference: 0, exceeds: false });
    expect(evaluateTurbidity(lake, 31, 30)).toMatchObject({ limit: 30, difference: 1, exceeds: true });
  });
  it("without a paired background, judges against the limit alone and says it is unpaired", () => {
    expect(evaluateTurbidity(lake, 31, null)).toMatchObject({ paired: false, limit: 25, exceeds: true });
    expect(evaluateTurbidity(lake, 20, null)).toMatchObject({ paired: false, limit: 25, exceeds: false });
  });
});

// An older state criterion quoted in a hydropower licence document (published): +5 NTU when
// background ≤ 50 NTU, +10 % above 50, capped at +25 NTU, i.e. 10 % held between a floor of 5 and a cap of 25.
describe("percent over background (+10 %, floor +5 NTU, cap +25 NTU: older state criterion)", () => {
  const percent = rule({ kind: "percent-over-background", percent: 10, floorNtu: 5, capNtu: 25 });
  it("background 20 → limit 25 (the floor: 10 % is only 2)", () => {
    expect(evaluateTurbidity(percent, 25, 20)).toMatchObject({ limit: 25, exceeds: false });
    expect(evaluateTurbidity(percent, 25.1, 20).exceeds).toBe(true);
  });
  it("background 400 → limit 425 (the cap: 10 % would be 40)", () => {
    expect(evaluateTurbidity(percent, 425, 400)).toMatchObject({ limit: 425, exceeds: false });
    expect(evaluateTurbidity(percent, 430, 400).exceeds).toBe(true);
  });
  it("between floor and cap the allowance is 10 % of background (computed: 150 → 15)", () => {
    expect(percentRuleAllowance(percent, 150)).toBe(15);
    // At 50 NTU the two statements of the criterion agree: +5 either way (computed).
    expect(percentRuleAllowance(percent, 50)).toBe(5);
  });
  it("gives no verdict without a background", () => {
    expect(evaluateTurbidity(percent, 300, null).exceeds).toBeNull();
  });
});

describe("the verdict in words", () => {
  it("names the figures, or says why there is none", () => {
    expect(verdictInWords(evaluateTurbidity(florida(true), 34.5, 5))).toMatch(/^Exceeds the limit of 34 NTU \(background 5 NTU, difference 29.5 NTU\)/);
    expect(verdictInWords(evaluateTurbidity(florida(true), 33, 5))).toMatch(/^Within/);
    expect(verdictInWords(evaluateTurbidity(florida(true), 33, null))).toMatch(/^No verdict/);
  });
  it("says so when FNU readings are judged against a rule stated in NTU, and not otherwise", () => {
    expect(verdictInWords(evaluateTurbidity(florida(true), 33, 5), "FNU")).toContain("rule stated in NTU");
    expect(verdictInWords(evaluateTurbidity(florida(true), 33, 5), "NTU")).not.toContain("FNU");
  });
  it("a rule stated in FNU judges FNU readings without a remark, and says so for NTU readings (practice: the permit names the unit)", () => {
    expect(verdictInWords(evaluateTurbidity(florida(true), 33, 5), "FNU", "FNU")).toBe("Within the limit of 34 FNU (background 5 FNU, difference 28 FNU).");
    expect(verdictInWords(evaluateTurbidity(florida(true), 33, 5), "NTU", "FNU")).toContain("Readings in NTU judged against a rule stated in FNU");
  });
});
