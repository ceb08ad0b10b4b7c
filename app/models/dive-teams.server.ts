import { Op, type Transaction } from "sequelize";
import { z } from "zod";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import { Assignment, Dive, DiveTeam, Find, getSequelize, Membership, User, type DiveTeamMember } from "~/lib/db.server";
import { ConflictError, NotFoundError, ValidationError, type ErrorDetail } from "~/lib/errors";
import { DIAMETER_UNITS, describeEquipment, diameterProblem, diameterUnitFor, equipmentIn, type DiameterUnit, type TeamEquipment } from "../../shared/dive-plan/equipment";

/**
 * A project's dive teams: name, crew (project members or named crew), hoses and pumps (each with its
 * diameter, in inches or millimetres as the project's length unit goes) and station. The one
 * service the teams API, the teams page and the demo seeder go through. A team with dives,
 * assignments or finds on record is never deleted: it is retired, so every log still names it,
 * and it can be brought back. Every change is audited with the team before and after.
 */

const teamName = z.string({ error: "Give the team a name" }).trim().min(1, "Give the team a name").max(120, "A team name has at most 120 characters");

/** A crew member as sent: a project member's user id, a name (a member's name or e-mail links them; any other name is named crew), or written out. */
const crewEntry = z.union([
  z.number({ error: "A crew member is a member's user id, a name, or {name, email, duty}" }).int().positive(),
  z.string().trim().min(1, "A crew member's name cannot be blank").max(120, "A name has at most 120 characters"),
  z.object({
    name: z.string().trim().min(1, "A crew member needs a name").max(120, "A name has at most 120 characters"),
    email: z.union([z.literal(""), z.email("is not an e-mail address")]).optional(),
    duty: z.string().trim().max(60, "A duty has at most 60 characters").optional(),
  }),
]);

/**
 * A hose or pump as sent: `{name, diameter?, diameterUnit?}`, or its name alone (the teams API's
 * first form, still taken). A diameter left out keeps the one the team has for that name (none for
 * a new one); null clears it. The unit, when given, must be the project's (checked by the service,
 * which also checks the plausible range), so a team read from the API can be sent back as it is.
 */
function equipmentEntry(what: "hose" | "pump") {
  return z.preprocess(
    (value) => (typeof value === "string" ? { name: value } : value),
    z.object(
      {
        name: z.string({ error: `A ${what} needs a name` }).trim().min(1, `A ${what} needs a name`).max(120, `A ${what} name has at most 120 characters`),
        diameter: z.number({ error: "A diameter is a number (inches or millimetres, as the project's length unit goes)" }).finite("A diameter is a number").positive("A diameter must be more than 0").nullable().optional(),
        diameterUnit: z.enum(DIAMETER_UNITS, { error: `A diameter's unit is ${DIAMETER_UNITS.join(" or ")}` }).optional(),
      },
      { error: `A ${what} is its name, or {name, diameter}` },
    ),
  );
}
export type EquipmentInput = z.infer<ReturnType<typeof equipmentEntry>>;

export const teamInputSchema = z.object({
  name: teamName,
  members: z.array(crewEntry).max(30, "A team lists at most 30 people").optional(),
  hoses: z.array(equipmentEntry("hose")).max(20, "A team runs at most 20 hoses").optional(),
  pumps: z.array(equipmentEntry("pump")).max(10, "A team runs at most 10 pumps").optional(),
  station: z.string({ error: "The station is text" }).trim().max(200, "A station has at most 200 characters").optional(),
});
export type TeamInput = z.infer<typeof teamInputSchema>;

export const teamPatchSchema = teamInputSchema
  .partial()
  .extend({
    /** true retires the team (as DELETE does for a team with records); false brings it back. */
    retired: z.boolean({ error: "retired is true or false" }).optional(),
  })
  .refine((patch) => Object.values(patch).some((value) => value !== undefined), "Send at least one of name, members, hoses, pumps, station, retired");
export type TeamPatch = z.infer<typeof teamPatchSchema>;

export interface DiveTeamView {
  id: number;
  name: string;
  station: string;
  /** Each with its diameter in the project's unit family (`diameterUnit`: in or mm); null when not given. */
  hoses: TeamEquipment[];
  pumps: TeamEquipment[];
  members: DiveTeamMember[];
  /** Fewer people than the project's minimum team size: the plan flags it. */
  belowMinimum: boolean;
  /** When the team was retired (ISO 8601); null: in service. */
  retiredAt: string | null;
}

export function presentTeam(team: DiveTeam, project: Pick<ProjectView, "minTeamSize" | "lengthUnit">): DiveTeamView {
  const { members } = team;
  const unit = diameterUnitFor(project.lengthUnit);
  return {
    id: team.id,
    name: team.name,
    station: team.station,
    hoses: team.hoses.map((entry) => equipmentIn(entry, unit)),
    pumps: team.pumps.map((entry) => equipmentIn(entry, unit)),
    members,
    belowMinimum: members.length < project.minTeamSize,
    retiredAt: team.retiredAt ? team.retiredAt.toISOString() : null,
  };
}

/** The teams in service, in their order (the plans and the map offer these); `retired: true` adds the retired ones after them. */
export async function listDiveTeams(project: ProjectView, options: { retired?: boolean } = {}): Promise<DiveTeamView[]> {
  const teams = await DiveTeam.findAll({
    where: { projectId: project.id, ...(options.retired ? {} : { retiredAt: null }) },
    order: [["sortOrder", "ASC"], ["id", "ASC"]],
  });
  const views = teams.map((team) => presentTeam(team, project));
  return [...views.filter((team) => team.retiredAt === null), ...views.filter((team) => team.retiredAt !== null)];
}

async function findTeam(project: ProjectView, teamId: number, transaction?: Transaction): Promise<DiveTeam> {
  const team = await DiveTeam.findOne({ where: { id: teamId, projectId: project.id }, transaction, lock: transaction ? transaction.LOCK.UPDATE : undefined });
  if (!team) throw new NotFoundError("There is no such dive team on this project.");
  return team;
}

const normalisedName = (name: string) => name.trim().replace(/\s+/g, " ").toLowerCase();

/** The crew as stored: members resolved to their name and e-mail, named crew as written. Problems name `members.<n>`. */
async function resolveCrew(project: ProjectView, entries: NonNullable<TeamInput["members"]>, problems: ErrorDetail[], transaction: Transaction): Promise<DiveTeamMember[]> {
  const memberships = await Membership.findAll({
    where: { projectId: project.id },
    include: [{ model: User, as: "user", required: true, attributes: ["id", "name", "email"] }],
    transaction,
  });
  const people = memberships.map((membership) => ({ userId: membership.userId, name: membership.user!.name, email: membership.user!.email }));
  const crew: DiveTeamMember[] = [];
  const seen = new Set<string>();
  entries.forEach((entry, index) => {
    const field = `members.${index}`;
    let member: DiveTeamMember;
    if (typeof entry === "number") {
      const person = people.find((candidate) => candidate.userId === entry);
      if (!person) {
        problems.push({ field, value: String(entry), message: `No member of this project has the user id ${entry}; name the person instead, or add them on the members page.` });
        return;
      }
      member = { name: person.name, email: person.email, duty: "", userId: person.userId };
    } else if (typeof entry === "string") {
      const wanted = normalisedName(entry);
      const person = people.find((candidate) => normalisedName(candidate.name) === wanted || candidate.email.toLowerCase() === wanted);
      member = person ? { name: person.name, email: person.email, duty: "", userId: person.userId } : { name: entry.trim().replace(/\s+/g, " "), email: "", duty: "" };
    } else {
      // A member is known by e-mail, or by name when no e-mail is given.
      const person = entry.email
        ? people.find((candidate) => candidate.email.toLowerCase() === entry.email!.toLowerCase())
        : people.find((candidate) => normalisedName(candidate.name) === normalisedName(entry.name));
      member = person
        ? { name: person.name, email: person.email, duty: entry.duty ?? "", userId: person.userId }
        : { name: entry.name.replace(/\s+/g, " "), email: entry.email ?? "", duty: entry.duty ?? "" };
    }
    const key = normalisedName(member.name);
    if (seen.has(key)) {
      problems.push({ field, value: member.name, message: `${member.name} is listed twice on this team.` });
      return;
    }
    seen.add(key);
    crew.push(member);
  });
  return crew;
}

/**
 * The hoses or pumps as stored: names unique (either case), diameters in the project's unit family
 * and within the plausible range (shared/dive-plan/equipment.ts). An entry without a diameter keeps
 * the one `kept` has under its name. Problems name `hoses.<n>` or `pumps.<n>` and the field.
 */
function checkEquipment(field: "hoses" | "pumps", entries: EquipmentInput[], unit: DiameterUnit, kept: TeamEquipment[], problems: ErrorDetail[]): TeamEquipment[] {
  const what = field === "hoses" ? "hose" : "pump";
  const seen = new Set<string>();
  const checked: TeamEquipment[] = [];
  entries.forEach((entry, index) => {
    const key = entry.name.toLowerCase();
    if (seen.has(key)) {
      problems.push({ field: `${field}.${index}`, value: entry.name, message: `The ${what} "${entry.name}" is listed twice.` });
      return;
    }
    seen.add(key);
    if (entry.diameterUnit !== undefined && entry.diameterUnit !== unit) {
      problems.push({ field: `${field}.${index}.diameterUnit`, value: entry.diameterUnit, message: `The ${what} "${entry.name}": this project gives diameters in ${unit === "in" ? "inches (in)" : "millimetres (mm)"}, as its length unit goes.` });
      return;
    }
    if (entry.diameter === undefined) {
      const known = kept.find((candidate) => candidate.name.toLowerCase() === key);
      checked.push(known ? { ...equipmentIn(known, unit), name: entry.name } : { name: entry.name, diameter: null, diameterUnit: unit });
      return;
    }
    const problem = entry.diameter === null ? null : diameterProblem(entry.diameter, unit);
    if (problem) {
      problems.push({ field: `${field}.${index}.diameter`, value: String(entry.diameter), message: `The ${what} "${entry.name}": its diameter ${problem}` });
      return;
    }
    checked.push({ name: entry.name, diameter: entry.diameter, diameterUnit: unit });
  });
  return checked;
}

/** A ConflictError naming `name` when another team of the project (in service or retired) has it. */
async function assertNameFree(project: ProjectView, name: string, exceptId: number | null, transaction: Transaction): Promise<void> {
  const others = await DiveTeam.findAll({ where: { projectId: project.id, ...(exceptId === null ? {} : { id: { [Op.ne]: exceptId } }) }, attributes: ["id", "name", "retiredAt"], transaction });
  const same = others.find((team) => normalisedName(team.name) === normalisedName(name));
  if (!same) return;
  throw new ConflictError({
    field: "name",
    value: name,
    message: same.retiredAt
      ? `A retired team is already named ${same.name}; bring it back instead (it keeps its logs), or choose another name.`
      : `This project already has a team named ${same.name}; choose another name.`,
  }, { teamId: same.id });
}

/** Whether anything on record names the team: its dives, assignments or finds. */
async function recordsOf(teamId: number, transaction: Transaction) {
  const [dives, assignments, finds] = await Promise.all([
    Dive.count({ where: { teamId }, transaction }),
    Assignment.count({ where: { teamId }, transaction }),
    Find.count({ where: { teamId }, transaction }),
  ]);
  return { dives, assignments, finds };
}

const audited = (team: DiveTeamView) => ({
  name: team.name, station: team.station, hoses: team.hoses.map(describeEquipment), pumps: team.pumps.map(describeEquipment),
  members: team.members.map((member) => member.name), retired: team.retiredAt !== null,
});

/** Adds a team; ValidationError naming each bad field, ConflictError for a name taken. */
export async function createDiveTeam(project: ProjectView, actor: UserView, input: TeamInput, options: { ip?: string | null; transaction?: Transaction } = {}): Promise<DiveTeamView> {
  const create = async (transaction: Transaction) => {
    const problems: ErrorDetail[] = [];
    const members = await resolveCrew(project, input.members ?? [], problems, transaction);
    const unit = diameterUnitFor(project.lengthUnit);
    const hoses = checkEquipment("hoses", input.hoses ?? [], unit, [], problems);
    const pumps = checkEquipment("pumps", input.pumps ?? [], unit, [], problems);
    if (problems.length > 0) throw new ValidationError(problems);
    await assertNameFree(project, input.name, null, transaction);
    const last = (await DiveTeam.max("sortOrder", { where: { projectId: project.id }, transaction })) as number | null;
    const team = await DiveTeam.create({ projectId: project.id, name: input.name, station: input.station ?? "", hoses, pumps, members, sortOrder: (last ?? 0) + 1 }, { transaction });
    const view = presentTeam(team, project);
    await recordAudit({ action: AUDIT_ACTIONS.teamCreated, projectId: project.id, userId: actor.id, ip: options.ip ?? null, detail: { after: audited(view) } }, transaction);
    return view;
  };
  return options.transaction ? create(options.transaction) : getSequelize().transaction(create);
}

/** Changes a team (`retired` retires it or brings it back); NotFoundError, ValidationError, ConflictError as for creating. */
export function updateDiveTeam(project: ProjectView, actor: UserView, teamId: number, patch: TeamPatch, options: { ip?: string | null } = {}): Promise<DiveTeamView> {
  return getSequelize().transaction(async (transaction) => {
    const team = await findTeam(project, teamId, transaction);
    const before = presentTeam(team, project);
    const problems: ErrorDetail[] = [];
    const members = patch.members ? await resolveCrew(project, patch.members, problems, transaction) : null;
    const unit = diameterUnitFor(project.lengthUnit);
    const hoses = patch.hoses ? checkEquipment("hoses", patch.hoses, unit, team.hoses, problems) : null;
    const pumps = patch.pumps ? checkEquipment("pumps", patch.pumps, unit, team.pumps, problems) : null;
    if (problems.length > 0) throw new ValidationError(problems);
    if (patch.name !== undefined && normalisedName(patch.name) !== normalisedName(team.name)) await assertNameFree(project, patch.name, team.id, transaction);
    if (patch.name !== undefined) team.name = patch.name;
    if (patch.station !== undefined) team.station = patch.station;
    if (members) team.members = members;
    if (hoses) team.hoses = hoses;
    if (pumps) team.pumps = pumps;
    if (patch.retired !== undefined) team.retiredAt = patch.retired ? (team.retiredAt ?? new Date()) : null;
    await team.save({ transaction });
    const after = presentTeam(team, project);
    const action = before.retiredAt === null && after.retiredAt !== null ? AUDIT_ACTIONS.teamRetired : before.retiredAt !== null && after.retiredAt === null ? AUDIT_ACTIONS.teamReturned : AUDIT_ACTIONS.teamChanged;
    await recordAudit({ action, projectId: project.id, userId: actor.id, ip: options.ip ?? null, detail: { before: audited(before), after: audited(after) } }, transaction);
    return after;
  });
}

/**
 * Removes a team. One with nothing on record is deleted ("deleted"); one whose dives, assignments
 * or finds name it is retired instead ("retired"): the logs, day sheets and finds keep naming it,
 * and it leaves the plans' choice of teams. Retiring a retired team changes nothing.
 */
export function removeDiveTeam(project: ProjectView, actor: UserView, teamId: number, options: { ip?: string | null } = {}): Promise<{ outcome: "deleted" | "retired"; team: DiveTeamView; records: { dives: number; assignments: number; finds: number } }> {
  return getSequelize().transaction(async (transaction) => {
    const team = await findTeam(project, teamId, transaction);
    const before = presentTeam(team, project);
    const records = await recordsOf(team.id, transaction);
    if (records.dives + records.assignments + records.finds === 0) {
      await team.destroy({ transaction });
      await recordAudit({ action: AUDIT_ACTIONS.teamDeleted, projectId: project.id, userId: actor.id, ip: options.ip ?? null, detail: { before: audited(before) } }, transaction);
      return { outcome: "deleted" as const, team: before, records };
    }
    if (!team.retiredAt) {
      team.retiredAt = new Date();
      await team.save({ transaction });
      await recordAudit({ action: AUDIT_ACTIONS.teamRetired, projectId: project.id, userId: actor.id, ip: options.ip ?? null, detail: { before: audited(before), records } }, transaction);
    }
    return { outcome: "retired" as const, team: presentTeam(team, project), records };
  });
}

/** Why a team was retired rather than deleted, in words. */
export function retiredBecause(records: { dives: number; assignments: number; finds: number }): string {
  const parts = [
    records.dives > 0 && `${records.dives} dive${records.dives === 1 ? "" : "s"}`,
    records.assignments > 0 && `${records.assignments} assigned cell${records.assignments === 1 ? "" : "s"}`,
    records.finds > 0 && `${records.finds} find${records.finds === 1 ? "" : "s"}`,
  ].filter(Boolean);
  return `It was retired rather than deleted: ${parts.join(", ")} on record name it, and the logs keep it. It no longer appears when planning; bring it back at any time.`;
}
