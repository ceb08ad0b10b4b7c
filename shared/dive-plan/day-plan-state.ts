/**
 * Where a day plan stands against the project's today (local days, YYYY-MM-DD, compared as text):
 * a later day is upcoming (no dive can be logged on it yet), today is in hand, and an earlier day
 * either has dives logged or has none (worth a look: planned work with no dive on record).
 */
export type DayPlanState = "upcoming" | "today" | "dives-logged" | "no-dives-logged";

export const DAY_PLAN_STATE_LABELS: Record<DayPlanState, string> = {
  upcoming: "Upcoming",
  today: "Today",
  "dives-logged": "Dives logged",
  "no-dives-logged": "No dives logged",
};

export function dayPlanState(date: string, today: string, dives: number): DayPlanState {
  if (date > today) return "upcoming";
  if (date === today) return "today";
  return dives > 0 ? "dives-logged" : "no-dives-logged";
}
