/**
 * "Set up this project": the steps a new project goes through before its first survey, each one
 * done or not from what the project actually holds (never from a flag someone ticked), so the
 * guide can be left and resumed at any time and always says the truth.
 */

/** What the project holds, as far as setting it up is concerned. */
export interface SetupFacts {
  agency: string;
  permitNumbers: string;
  /** The EPSG code, e.g. "EPSG:2237"; null when none is set. */
  crs: string | null;
  hasWorkLimit: boolean;
  /** Cells of the grid over the work limit; null without a work limit. */
  cellCount: number | null;
  zoneCount: number;
  hasWorkDay: boolean;
  hasEmergencyInfo: boolean;
  /** Dive teams in service (retired ones do not count). */
  activeTeamCount: number;
  /** Members of the project, the manager included. */
  memberCount: number;
  /** Invitations sent and not yet accepted, revoked or expired. */
  openInvitationCount: number;
  /** Surveys stored (active or retracted). */
  surveyCount: number;
}

export const SETUP_STEP_KEYS = ["identity", "coordinates", "work-limit", "grid", "zones", "settings", "teams", "members", "first-survey"] as const;
export type SetupStepKey = (typeof SETUP_STEP_KEYS)[number];

export interface SetupStep {
  key: SetupStepKey;
  /** 1-based position, as the page counts. */
  number: number;
  title: string;
  done: boolean;
  /** What the project holds for this step now, or what is missing, in words. */
  state: string;
}

export interface SetupProgress {
  steps: SetupStep[];
  doneCount: number;
  total: number;
  complete: boolean;
  /** The first step not done, where the guide opens; null once every step is done. */
  firstOpen: SetupStepKey | null;
}

const plural = (count: number, one: string, many = `${one}s`) => `${count.toLocaleString("en-US")} ${count === 1 ? one : many}`;

/** Each step's done-ness and state, in the guide's order. */
export function computeSetupProgress(facts: SetupFacts): SetupProgress {
  const identityMissing = [facts.agency.trim() === "" && "the agency or client", facts.permitNumbers.trim() === "" && "the permit numbers"].filter(Boolean);
  const settingsMissing = [!facts.hasWorkDay && "the working hours", !facts.hasEmergencyInfo && "the emergency information"].filter(Boolean);
  const others = facts.memberCount - 1;
  const rows: Array<Omit<SetupStep, "number">> = [
    {
      key: "identity",
      title: "Name, agency and permits",
      done: identityMissing.length === 0,
      state: identityMissing.length === 0 ? "Agency and permit numbers are set." : `Missing: ${identityMissing.join(" and ")}.`,
    },
    {
      key: "coordinates",
      title: "Coordinate system",
      done: facts.crs !== null,
      state: facts.crs !== null ? `${facts.crs} is set.` : "No coordinate system yet.",
    },
    {
      key: "work-limit",
      title: "Work limit",
      done: facts.hasWorkLimit,
      state: facts.hasWorkLimit ? "The work limit is set." : "No work limit yet.",
    },
    {
      key: "grid",
      title: "Grid",
      done: facts.cellCount !== null && facts.cellCount > 0,
      state: facts.cellCount === null ? "No grid until a work limit is set." : facts.cellCount > 0 ? `The grid has ${plural(facts.cellCount, "cell")}.` : "The grid has no cells inside the work limit.",
    },
    {
      key: "zones",
      title: "Zones",
      done: facts.zoneCount > 0,
      state: facts.zoneCount > 0 ? `${plural(facts.zoneCount, "zone")} drawn or uploaded.` : "No zones yet: the whole work limit counts as one.",
    },
    {
      key: "settings",
      title: "Tolerances, hours and emergency information",
      done: settingsMissing.length === 0,
      state: settingsMissing.length === 0 ? "Working hours and emergency information are set." : `Missing: ${settingsMissing.join(" and ")}.`,
    },
    {
      key: "teams",
      title: "Dive teams",
      done: facts.activeTeamCount > 0,
      state: facts.activeTeamCount > 0 ? `${plural(facts.activeTeamCount, "dive team")} in service.` : "No dive team yet.",
    },
    {
      key: "members",
      title: "Members and invitations",
      done: others > 0 || facts.openInvitationCount > 0,
      state:
        others > 0 || facts.openInvitationCount > 0
          ? [others > 0 && `${plural(others, "other member")}`, facts.openInvitationCount > 0 && `${plural(facts.openInvitationCount, "invitation")} waiting`].filter(Boolean).join(", ") + "."
          : "Nobody else is in the project yet.",
    },
    {
      key: "first-survey",
      title: "First survey",
      done: facts.surveyCount > 0,
      state: facts.surveyCount > 0 ? `${plural(facts.surveyCount, "survey")} imported.` : "No survey imported yet: the baseline comes first.",
    },
  ];
  const steps = rows.map((step, index) => ({ ...step, number: index + 1 }));
  const doneCount = steps.filter((step) => step.done).length;
  return { steps, doneCount, total: steps.length, complete: doneCount === steps.length, firstOpen: steps.find((step) => !step.done)?.key ?? null };
}

/** The steps before and after `key` in the guide's order (null at either end). */
export function neighbouringSteps(key: SetupStepKey): { previous: SetupStepKey | null; next: SetupStepKey | null } {
  const index = SETUP_STEP_KEYS.indexOf(key);
  return { previous: SETUP_STEP_KEYS[index - 1] ?? null, next: SETUP_STEP_KEYS[index + 1] ?? null };
}
