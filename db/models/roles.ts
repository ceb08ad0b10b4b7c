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

/**
 * The one way a role is shown to people: its label ("Dewatering operator"), never its internal
 * name. `null` is a site administrator who is not a member. In running text ("… as dewatering
 * operator") ask for the sentence form.
 */
export function roleLabel(role: Role | null, form: "title" | "sentence" = "title"): string {
  const label = role === null ? "Site administrator" : ROLE_LABELS[role];
  return form === "sentence" ? label.toLowerCase() : label;
}

export function isRole(value: unknown): value is Role {
  return typeof value === "string" && (ROLES as readonly string[]).includes(value);
}
