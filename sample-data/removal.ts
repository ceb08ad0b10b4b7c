/**
 * The demo's dredging story, cell by cell: after each pass a 20 ft grid cell is either done
 * (muck left within a few hundredths to tenths of a foot of firm sand), in work (part of the muck
 * removed) or untouched. Divers work whole cells, so the state is drawn per cell.
 */
import type { Random } from "./prng";

export type CellWork = "done" | "in-work" | "untouched";

export interface PassPlan {
  /** Chooses a cell's state from where its centre is down the run (ft from the vent). */
  chooseWork(random: Random, alongRunFt: number): CellWork;
}

export const PASS_PLANS: Record<"progress-1" | "progress-2" | "progress-3" | "closeout", PassPlan> = {
  // First pass in the vent basin: most cells reach firm sand.
  "progress-1": { chooseWork: (random) => (random.next() < 0.8 ? "done" : "in-work") },
  "progress-2": { chooseWork: (random) => (random.next() < 0.85 ? "done" : "in-work") },
  // Lower run part way: the crew works downstream, so the far end is still untouched.
  "progress-3": {
    chooseWork(random, alongRunFt) {
      const draw = random.next();
      if (alongRunFt < 530) return draw < 0.8 ? "done" : "in-work";
      if (alongRunFt < 630) return draw < 0.2 ? "done" : draw < 0.8 ? "in-work" : "untouched";
      return draw < 0.15 ? "in-work" : "untouched";
    },
  },
  // Closeout: the vent basin was finished after progress 1, and this pass confirms it.
  closeout: { chooseWork: () => "done" },
};

export interface CellOutcome {
  work: CellWork;
  /** Done: the muck left, ft. In work: the share of the baseline thickness left. */
  amount: number;
}

export function drawCellOutcome(plan: PassPlan, random: Random, alongRunFt: number): CellOutcome {
  const work = plan.chooseWork(random, alongRunFt);
  if (work === "done") return { work, amount: random.between(0.02, 0.12) };
  if (work === "in-work") return { work, amount: random.between(0.3, 0.7) };
  return { work, amount: 1 };
}

export function remainingThicknessFt(outcome: CellOutcome, baselineThicknessFt: number): number {
  if (outcome.work === "done") return Math.min(outcome.amount, baselineThicknessFt);
  // A partly dredged cell keeps at least 0.4 ft, well above the tolerance.
  if (outcome.work === "in-work") return Math.max(0.4, outcome.amount * baselineThicknessFt);
  return baselineThicknessFt;
}
