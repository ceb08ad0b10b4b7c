import { describe, expect, it } from "vitest";
import { SETUP_STEP_KEYS, computeSetupProgress, neighbouringSteps, type SetupFacts } from "./setup-steps";

// What the new-project form leaves (name, CRS, work limit, the unit's default grid; the creator as
// the only member) and what a project ready for its first dive day holds (practice: the
// first-morning path of issue 11 — identity, coordinates, work limit, grid, zones, settings,
// members, then the baseline survey).
const justCreated: SetupFacts = {
  agency: "",
  permitNumbers: "",
  crs: "EPSG:2237",
  hasWorkLimit: true,
  cellCount: 412,
  zoneCount: 0,
  hasWorkDay: false,
  hasEmergencyInfo: false,
  activeTeamCount: 0,
  memberCount: 1,
  openInvitationCount: 0,
  surveyCount: 0,
};
const ready: SetupFacts = {
  ...justCreated,
  agency: "Yellowmarsh Water District",
  permitNumbers: "SWF-2026-0101",
  zoneCount: 2,
  hasWorkDay: true,
  hasEmergencyInfo: true,
  activeTeamCount: 1,
  memberCount: 3,
  surveyCount: 1,
};

const doneKeys = (facts: SetupFacts) => computeSetupProgress(facts).steps.filter((step) => step.done).map((step) => step.key);

describe("computeSetupProgress", () => {
  it("counts what the new-project form already holds as done, and opens on the first step left (practice)", () => {
    const progress = computeSetupProgress(justCreated);
    expect(doneKeys(justCreated)).toEqual(["coordinates", "work-limit", "grid"]);
    expect(progress.doneCount).toBe(3);
    expect(progress.total).toBe(9);
    expect(progress.complete).toBe(false);
    expect(progress.firstOpen).toBe("identity");
    expect(progress.steps.map((step) => step.number)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9]);
    expect(progress.steps.map((step) => step.key)).toEqual([...SETUP_STEP_KEYS]);
  });

  it("is complete only when every step's data is there (practice)", () => {
    const progress = computeSetupProgress(ready);
    expect(progress.complete).toBe(true);
    expect(progress.doneCount).toBe(progress.total);
    expect(progress.firstOpen).toBeNull();
  });

  // Negative controls: taking away one fact from a ready project undoes exactly its own step.
  const oneMissing: Array<[string, Partial<SetupFacts>, string]> = [
    ["no agency", { agency: "  " }, "identity"],
    ["no permit numbers", { permitNumbers: "" }, "identity"],
    ["no CRS", { crs: null }, "coordinates"],
    ["no work limit", { hasWorkLimit: false, cellCount: null }, "work-limit"],
    ["no zone", { zoneCount: 0 }, "zones"],
    ["no working hours", { hasWorkDay: false }, "settings"],
    ["no emergency information", { hasEmergencyInfo: false }, "settings"],
    ["no team in service", { activeTeamCount: 0 }, "teams"],
    ["the manager alone, no invitation", { memberCount: 1, openInvitationCount: 0 }, "members"],
    ["no survey", { surveyCount: 0 }, "first-survey"],
  ];
  it.each(oneMissing)("%s undoes only its step (computed)", (_what, change, key) => {
    const progress = computeSetupProgress({ ...ready, ...change });
    const notDone = progress.steps.filter((step) => !step.done).map((step) => step.key);
    // A missing work limit also leaves no grid: the grid is drawn over it.
    expect(notDone).toEqual(key === "work-limit" ? ["work-limit", "grid"] : [key]);
    expect(progress.firstOpen).toBe(key);
    expect(progress.complete).toBe(false);
  });

  it("counts an invitation waiting as the members step done, and says so (practice)", () => {
    const step = computeSetupProgress({ ...justCreated, openInvitationCount: 2 }).steps.find((s) => s.key === "members")!;
    expect(step.done).toBe(true);
    expect(step.state).toBe("2 invitations waiting.");
  });

  it("names what is missing in words (practice)", () => {
    const steps = computeSetupProgress(justCreated).steps;
    expect(steps.find((step) => step.key === "identity")!.state).toBe("Missing: the agency or client and the permit numbers.");
    expect(steps.find((step) => step.key === "settings")!.state).toBe("Missing: the working hours and the emergency information.");
    expect(steps.find((step) => step.key === "grid")!.state).toBe("The grid has 412 cells.");
  });

  it("does not count a grid without cells inside the work limit (computed)", () => {
    expect(doneKeys({ ...justCreated, cellCount: 0 })).not.toContain("grid");
  });
});

describe("neighbouringSteps", () => {
  it("walks the steps in order and stops at both ends (computed)", () => {
    expect(neighbouringSteps("identity")).toEqual({ previous: null, next: "coordinates" });
    expect(neighbouringSteps("zones")).toEqual({ previous: "grid", next: "settings" });
    expect(neighbouringSteps("first-survey")).toEqual({ previous: "members", next: null });
  });
});
