/**
 * A permit's turbidity rule and the verdict on one compliance reading. Pure: numbers in, a verdict
 * out. The permit, the agency and licensed practice decide compliance; the verdict supports the
 * permit's monitoring and never replaces it.
 */

export const TURBIDITY_RULE_KINDS = ["above-background", "absolute", "percent-over-background"] as const;
export type TurbidityRuleKind = (typeof TURBIDITY_RULE_KINDS)[number];

export const TURBIDITY_UNITS = ["NTU", "FNU"] as const;
export type TurbidityUnit = (typeof TURBIDITY_UNITS)[number];

export interface TurbidityRule {
  kind: TurbidityRuleKind;
  /**
   * above-background: the most a compliance reading may be over the paired background (NTU);
   * absolute: the ceiling itself (NTU); percent-over-background: unused (null).
   */
  limitNtu: number | null;
  /** True when a reading exactly at the limit is within it ("not more than"), false when it exceeds ("less than"). */
  inclusive: boolean;
  /** percent-over-background only: the allowed increase as a share of background (10 for +10 %), held between floor and cap (NTU). */
  percent: number | null;
  floorNtu: number | null;
  capNtu: number | null;
}

export interface TurbidityEvaluation {
  /** A background reading within the pairing window was found. */
  paired: boolean;
  background: number | null;
  /** Compliance minus background (NTU); null when unpaired. */
  difference: number | null;
  /** The ceiling this reading was held to (NTU); null when no verdict was possible. */
  limit: number | null;
  /** null: no verdict (a relative rule without a paired background). */
  exceeds: boolean | null;
}

/**
 * Readings carry at most a few decimals; differences are rounded to a millionth so that binary
 * floating point (34.2 − 5.2 = 29.000000000000004) cannot turn a reading at the limit into an
 * exceedance.
 */
function rounded(value: number): number {
  return Math.round(value * 1e6) / 1e6;
}

function beyond(amount: number, limit: number, inclusive: boolean): boolean {
  return inclusive ? rounded(amount) > limit : rounded(amount) >= limit;
}

/** The allowed increase over background of a percent rule: percent of background, no less than the floor, no more than the cap. */
export function percentRuleAllowance(rule: Pick<TurbidityRule, "percent" | "floorNtu" | "capNtu">, backgroundNtu: number): number {
  const share = ((rule.percent ?? 0) / 100) * backgroundNtu;
  const floored = Math.max(share, rule.floorNtu ?? 0);
  return rounded(rule.capNtu === null ? floored : Math.min(floored, rule.capNtu));
}

/**
 * The verdict on a compliance reading (NTU) against `rule`, with the paired background reading or
 * null when none was found within the pairing window.
 *
 * - above background and percent over background need a background: unpaired, no verdict.
 * - absolute: judged against the limit alone when unpaired; with a background already above the
 *   limit, the reading may not increase it (held to the background, inclusive).
 */
export function evaluateTurbidity(rule: TurbidityRule, complianceNtu: number, backgroundNtu: number | null): TurbidityEvaluation {
  const paired = backgroundNtu !== null;
  const difference = paired ? rounded(complianceNtu - backgroundNtu) : null;
  switch (rule.kind) {
    case "above-background": {
      if (!paired) return { paired, background: null, difference: null, limit: null, exceeds: null };
      const allowed = rule.limitNtu ?? 0;
      return { paired, background: backgroundNtu, difference, limit: rounded(backgroundNtu + allowed), exceeds: beyond(difference!, allowed, rule.inclusive) };
    }
    case "percent-over-background": {
      if (!paired) return { paired, background: null, difference: null, limit: null, exceeds: null };
      const allowed = percentRuleAllowance(rule, backgroundNtu);
      return { paired, background: backgroundNtu, difference, limit: rounded(backgroundNtu + allowed), exceeds: beyond(difference!, allowed, rule.inclusive) };
    }
    case "absolute": {
      const ceiling = rule.limitNtu ?? 0;
      if (paired && backgroundNtu >= ceiling) {
        // The receiving water is already over the limit: the discharge must not increase it.
        return { paired, background: backgroundNtu, difference, limit: backgroundNtu, exceeds: difference! > 0 };
      }
      return { paired, background: backgroundNtu, difference, limit: ceiling, exceeds: beyond(complianceNtu, ceiling, rule.inclusive) };
    }
  }
}

/**
 * The verdict in words, as the reading form shows it at once after saving. `unit` is the
 * readings' unit (a reading is only ever paired with a background in the same unit), `ruleUnit`
 * the unit the rule's figures are stated in: the figures are compared as numbers, so when the two
 * differ the verdict says so.
 */
export function verdictInWords(evaluation: TurbidityEvaluation, unit: TurbidityUnit | string = "NTU", ruleUnit: TurbidityUnit = "NTU"): string {
  const figure = (value: number) => `${Number(value.toFixed(2))} ${unit}`;
  if (evaluation.exceeds === null) return "No verdict: no background reading within the pairing window. Take a background reading and resample.";
  const against = evaluation.background === null ? `the limit of ${figure(evaluation.limit!)}` : `the limit of ${figure(evaluation.limit!)} (background ${figure(evaluation.background)}, difference ${figure(evaluation.difference!)})`;
  const words = evaluation.exceeds ? `Exceeds ${against}. Stop the work causing it, notify, resample.` : `Within ${against}.`;
  return unit !== ruleUnit ? `${words} Readings in ${unit} judged against a rule stated in ${ruleUnit}: check that the permit allows it.` : words;
}
