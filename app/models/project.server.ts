import { Membership, Project, Zone, type LengthUnit, type Role } from "~/lib/db.server";
import { presentProject, type ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";

/** The projects the user belongs to (a site admin sees every project), with their role. */
export async function listProjectsForUser(user: UserView): Promise<Array<ProjectView & { role: Role | null }>> {
  if (user.isSiteAdmin) {
    const projects = await Project.findAll({ order: [["name", "ASC"]] });
    const memberships = await Membership.findAll({ where: { userId: user.id } });
    const roleByProject = new Map(memberships.map((m) => [m.projectId, m.role]));
    return projects.map((project) => ({ ...presentProject(project), role: roleByProject.get(project.id) ?? null }));
  }
  const memberships = await Membership.findAll({
    where: { userId: user.id },
    include: [{ model: Project, as: "project", required: true }],
    order: [[{ model: Project, as: "project" }, "name", "ASC"]],
  });
  return memberships.map((m) => ({ ...presentProject(m.project!), role: m.role }));
}

export interface ZoneView {
  id: number;
  name: string;
  sortOrder: number;
  /** One of the palette's (shared/zone-colours.ts). */
  colour: string;
}

export async function listZones(project: ProjectView): Promise<ZoneView[]> {
  const zones = await Zone.findAll({ where: { projectId: project.id }, order: [["sortOrder", "ASC"], ["name", "ASC"]] });
  return zones.map((zone) => ({ id: zone.id, name: zone.name, sortOrder: zone.sortOrder, colour: zone.colour }));
}
