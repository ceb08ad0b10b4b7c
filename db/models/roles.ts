/** Per-project roles, exactly as Firmsand names them. */
export const ROLES = ["manager", "surveyor", "dive-supervisor", "dewatering", "resource-monitor", "outreach", "viewer"] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  manager: "Project manager",
  surveyor: "Survey technician",
  "dive-supervisor": "Dive supervisor",
  dewatering: "Dewatering operator",
  "resource-monitor": "Resource monitor",
  outreach: "Outreach staff",
  viewer: "Viewer",
};

export function isRole(value: unknown): value is Role {
  return typeof value === "string" && (ROLES as readonly string[]).includes(value);
}
