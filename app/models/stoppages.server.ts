import type { ProjectView } from "~/lib/auth/project-view.server";
import { listStopWork, type StopWorkView } from "./water-quality.server";
import { listStandDowns, type StandDownView } from "./wildlife.server";

/**
 * What stops work on the project right now: open turbidity stop-work events and wildlife
 * stand-downs in force. Every project page shows them in one banner; the map's assign panel says
 * work is stopped.
 */
export interface Stoppages {
  stopWork: StopWorkView[];
  standDowns: StandDownView[];
  /** The server's clock when read, so the page's countdown starts from the same instant. */
  nowMs: number;
  timeZone: string;
}

export async function currentStoppages(project: ProjectView, nowMs = Date.now()): Promise<Stoppages> {
  const [stopWork, standDowns] = await Promise.all([listStopWork(project, { openOnly: true }, nowMs), listStandDowns(project, { activeOnly: true }, nowMs)]);
  return { stopWork, standDowns, nowMs, timeZone: project.timeZone };
}

/** One sentence for the assign panel; null when nothing stops work. */
export function workStoppedMessage(stoppages: Stoppages): string | null {
  const reasons = [
    ...stoppages.stopWork.map((event) => `a turbidity exceedance at ${event.station}`),
    ...stoppages.standDowns.map((standDown) => `a ${standDown.species} stand-down`),
  ];
  if (reasons.length === 0) return null;
  return `Work is stopped: ${reasons.join(" and ")}. No cells can be assigned for today until it is cleared (later days may be planned), and no in-water work meanwhile.`;
}
