import { describe, expect, it } from "vitest";
import { selectSurveysInForce, surveysInForceList, type DatedSurvey } from "./surveys-in-force";

// Hand-written survey histories, as a project's survey list shows them (practice: a baseline with
// probe, progress passes after each stretch of dredging, a closeout at the end).
const survey = (id: number, kind: DatedSurvey["kind"], surveyedOn: string): DatedSurvey => ({ id, kind, surveyedOn });
const ids = (surveys: DatedSurvey[]) => surveys.map((entry) => entry.id);

describe("selectSurveysInForce", () => {
  it("has nothing in force without an active baseline", () => {
    expect(selectSurveysInForce([])).toBeNull();
    expect(selectSurveysInForce([survey(2, "progress", "2026-03-01"), survey(3, "closeout", "2026-04-01")])).toBeNull();
  });

  it("takes the baseline alone when nothing else was surveyed", () => {
    const inForce = selectSurveysInForce([survey(7, "baseline", "2026-01-10")])!;
    expect(inForce.baseline.id).toBe(7);
    expect(inForce.later).toEqual([]);
  });

  it("stacks progress and closeout surveys by date, whatever order they arrive in", () => {
    const inForce = selectSurveysInForce([
      survey(4, "closeout", "2026-05-20"),
      survey(2, "progress", "2026-03-01"),
      survey(1, "baseline", "2026-01-10"),
      survey(3, "progress", "2026-04-15"),
    ])!;
    expect(inForce.baseline.id).toBe(1);
    expect(ids(inForce.later)).toEqual([2, 3, 4]);
    expect(ids(surveysInForceList(inForce))).toEqual([1, 2, 3, 4]);
  });

  it("orders two surveys of one date by id: the later upload is the newer bottom", () => {
    const inForce = selectSurveysInForce([survey(9, "progress", "2026-03-01"), survey(5, "progress", "2026-03-01"), survey(1, "baseline", "2026-01-10")])!;
    expect(ids(inForce.later)).toEqual([5, 9]);
  });

  it("takes the newest baseline by date; an older one takes no part", () => {
    const inForce = selectSurveysInForce([
      survey(1, "baseline", "2026-01-10"),
      survey(2, "progress", "2026-02-01"),
      survey(3, "baseline", "2026-06-01"), // re-surveyed for a second contract
      survey(4, "progress", "2026-07-01"),
    ])!;
    expect(inForce.baseline.id).toBe(3);
    expect(ids(inForce.later)).toEqual([2, 4]); // progress surveys are not compared with the baseline's date
  });

  it("breaks a tie between baselines of one date by id, the newer upload winning", () => {
    // A baseline uploaded again for the same date (a corrected file) replaces the first.
    expect(selectSurveysInForce([survey(8, "baseline", "2026-01-10"), survey(6, "baseline", "2026-01-10")])!.baseline.id).toBe(8);
    // A lower id with a later date still wins: the date decides first.
    expect(selectSurveysInForce([survey(2, "baseline", "2026-02-01"), survey(6, "baseline", "2026-01-10")])!.baseline.id).toBe(2);
  });

  it("leaves the caller's list as it was", () => {
    const active = [survey(3, "progress", "2026-04-15"), survey(1, "baseline", "2026-01-10")];
    selectSurveysInForce(active);
    expect(ids(active)).toEqual([3, 1]);
  });
});
