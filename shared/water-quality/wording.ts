/**
 * What the water-quality screens, e-mails and API answers say, and the kinds they offer, in one
 * place safe for browser and server alike.
 */

export const STATION_KINDS = ["background", "compliance", "outfall", "other"] as const;
export type StationKind = (typeof STATION_KINDS)[number];
export const DEPTH_RULES = ["surface", "mid-depth", "near-bottom"] as const;
export type DepthRule = (typeof DEPTH_RULES)[number];

export const WATER_QUALITY_CAUTION =
  "Readings support the permit's monitoring; the permit conditions, the agency and licensed practice decide compliance. On an exceedance, stop the work causing it, notify the agency as the permit requires, and resample until within the limit.";

export const STAND_DOWN_CAUTION =
  "Stop in-water equipment while the animal is within the shutdown distance; never chase, herd or touch it. It must leave on its own. Distance and wait follow the permit's conditions.";

/** Published examples a manager may start a rule from (each must still be checked against the permit). */
export const RULE_EXAMPLES = [
  { label: "29 NTU above natural background (state surface-water criterion)", kind: "above-background", limit: 29, source: "State surface-water turbidity criterion: not more than 29 NTU above natural background (as restated citing Rule 62-302.530, F.A.C.); check the permit's condition" },
  { label: "Zero above background (specially protected waters)", kind: "above-background", limit: 0, source: "Specially protected waters: no increase over background (Outstanding Florida Waters principle, Rule 62-302.700, F.A.C.); check the permit's condition" },
] as const;

/** The project roles whose members may be e-mailed on an exceedance (the settings page's boxes). */
export const ALERT_ROLE_CHOICES = ["manager", "dive-supervisor", "dewatering", "resource-monitor", "surveyor", "outreach", "viewer"] as const;
