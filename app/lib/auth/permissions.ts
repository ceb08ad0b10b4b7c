import { ROLES, type Role } from "./roles";

/**
 * The one permission table: what each project role may do. `requireRole` enforces it on the
 * server and loaders ask `can` to decide what a page offers, so a button is shown exactly when the
 * server would accept its request. Safe for browser code (no server imports).
 *
 * A site admin may do everything on every project, member or not: they set projects up and
 * support their people. Later features add their actions here, never a role check of their own.
 *
 * Who reads quantities, from practice: the manager signs them and exports them for payment; the
 * survey technician produced them and checks them before they go out; the dive supervisor plans
 * tomorrow's cells from what remains; viewers (funders, partner agencies) read the dashboards.
 * Outreach staff publish only the zone-level figures of the share page; the dewatering operator
 * and the resource monitor have no need of pay quantities.
 */
export const PERMISSIONS = {
  /** Overview, map, surveys, plans, the cells, bands and progress figures. */
  "project.read": ROLES,
  /** The quantities page, its printable report and the CSV/GeoJSON exports. */
  "quantities.read": ["manager", "surveyor", "dive-supervisor", "viewer"],
  /** Sign a pay period's report (kept as issued): the manager answers for the quantities paid on. */
  "quantities.sign": ["manager"],
  /** Invite members, change their roles, remove them. */
  "members.manage": ["manager"],
  "audit.read": ["manager"],
  /** The project's settings: identity, coordinates, work limit, grid, zones, tolerances. */
  "project.configure": ["manager"],
  /** The map's settings (the shoreline). */
  "map.configure": ["manager"],
  /** Upload and import sounding files, see the import's progress and problems. */
  "surveys.import": ["manager", "surveyor"],
  /** Every member's imports, not only one's own. */
  "surveys.import.others": ["manager"],
  /** Retract a survey (its soundings stop counting) or restore it. */
  "surveys.retract": ["manager"],
  /** Assign cells to dive teams, send the day's plan sheet. */
  "plans.assign": ["manager", "dive-supervisor"],
  "dives.log": ["manager", "dive-supervisor"],
  /** Shift logs, jar tests and their photos, the tube register and its fills, reuse and disposal sites, haul tickets and their photos. */
  "dewatering.log": ["manager", "dewatering"],
  /** Sediment samples' lab results (dry bulk density, N, P), which turn surveyed volume into mass. */
  "samples.record": ["manager", "resource-monitor"],
  /**
   * Water quality (the permit's turbidity monitoring). The dewatering operator or the resource
   * monitor takes the readings and the manager answers for them, so all three record readings;
   * the manager alone sets the stations, the permit's rules and the sampling routine. A stop-work
   * event closes when a manager or the monitor records the resumption (and the agency notice):
   * the operator whose discharge caused it does not clear it alone. Every member reads the
   * readings and the banner: the dive supervisor must know at once when work stops.
   */
  "water-quality.record": ["manager", "dewatering", "resource-monitor"],
  "water-quality.configure": ["manager"],
  "stop-work.resume": ["manager", "resource-monitor"],
  /**
   * Wildlife sightings: whoever watches the water near the work — the dive supervisor at the
   * intakes, the operator at the outfall, the monitor — and the manager; a sighting within the
   * shutdown distance starts a stand-down at once.
   */
  "wildlife.record": ["manager", "dive-supervisor", "dewatering", "resource-monitor"],
  /**
   * Finds: that they exist (category, catalogue number, status, custody) without any location.
   * Outreach sees nothing of finds: they publish, and site locations stay out of public view.
   */
  "finds.read": ["manager", "surveyor", "dive-supervisor", "dewatering", "resource-monitor", "viewer"],
  /** Log finds, their photos, custody handovers and status. */
  "finds.log": ["manager", "resource-monitor"],
  /** A find's cell, position, depths and its photos' camera data (confidential site locations). */
  "finds.locations.read": ["manager", "resource-monitor"],
  /** Lift a stop-work hold, recording who authorised resuming. */
  "holds.lift": ["manager", "resource-monitor"],
  /**
   * The daily reports: the day's compiled figures (finds without locations). Outreach publishes
   * and has no need of the day's record.
   */
  "reports.read": ["manager", "surveyor", "dive-supervisor", "dewatering", "resource-monitor", "viewer"],
  /**
   * Enter a day's weather and notes, sign the day's report, add amendments to a signed one, and
   * send the agency's inspector the one-time link to countersign it.
   */
  "reports.sign": ["manager", "dive-supervisor"],
  /**
   * Choose who receives the signed reports (members and outside addresses such as the agency's
   * contract manager) and send them a two-week batch: the manager answers for what leaves the project.
   */
  "reports.distribute": ["manager"],
  /** Public progress links. */
  "share-links.manage": ["manager", "outreach"],
  /**
   * Dive teams (their crew, hoses and station): the dive supervisor runs the crews day to day and
   * the manager sets the project up. Every member reads the teams. (The minimum team size and the
   * working hours are project settings: "project.configure".)
   */
  "teams.manage": ["manager", "dive-supervisor"],
  /** Archive a finished project (read-only from then on): the manager closes their project. */
  "project.archive": ["manager"],
  /** Restore an archived project: a site admin only (no project role), so reopening stays a deliberate step. */
  "project.restore": [],
} as const satisfies Record<string, readonly Role[]>;

export type Action = keyof typeof PERMISSIONS;

export const ACTIONS = Object.keys(PERMISSIONS) as Action[];

/**
 * The actions that only read. On an archived project these alone stay allowed (and restoring it):
 * everything else changes a record, and an archived project is read-only for everyone.
 */
export const READING_ACTIONS: ReadonlySet<Action> = new Set<Action>(["project.read", "quantities.read", "audit.read", "finds.read", "finds.locations.read", "reports.read"]);

/** Who is asking: their role on the project (null when not a member), whether they are a site admin, and whether the project is archived. */
export interface Access {
  role: Role | null;
  isSiteAdmin: boolean;
  /** The project is archived: read-only (absent: open). */
  archived?: boolean;
}

/** Whether the role (or being a site admin) allows `action`, whatever the project's state. */
export function roleAllows(access: Access, action: Action): boolean {
  if (access.isSiteAdmin) return true;
  return access.role !== null && (PERMISSIONS[action] as readonly Role[]).includes(access.role);
}

/** Whether the project's state refuses `action`: an archived project takes reads and its restoring only; an open one cannot be restored. */
export function refusedByProjectState(access: Access, action: Action): boolean {
  if (action === "project.restore") return !access.archived;
  return Boolean(access.archived) && !READING_ACTIONS.has(action);
}

export function can(access: Access, action: Action): boolean {
  return roleAllows(access, action) && !refusedByProjectState(access, action);
}

/** The actions `access` allows, for a loader to hand to its page. */
export function allowedActions(access: Access): Action[] {
  return ACTIONS.filter((action) => can(access, action));
}

/**
 * Creating a project concerns no project yet, so no project role can allow it: a site admin may,
 * and so may a user a site admin has allowed to (who then becomes the new project's manager).
 */
export function canCreateProjects(user: { isSiteAdmin: boolean; mayCreateProjects: boolean }): boolean {
  return user.isSiteAdmin || user.mayCreateProjects;
}

/** Managing accounts (listing them, disabling, allowing project creation) is the site admin's alone. */
export function canManageAccounts(user: { isSiteAdmin: boolean }): boolean {
  return user.isSiteAdmin;
}
