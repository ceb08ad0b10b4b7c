import { Project, type LengthUnit } from "~/lib/db.server";
import { projectGrid, type ProjectGrid } from "~/lib/engine/project-geometry.server";

/**
 * The project an access check admits the request to, as every model function takes it (the
 * owner that scopes its queries). Lives with access rather than with the project's model so that
 * the access check needs nothing above it.
 */
export interface ProjectView {
  id: number;
  name: string;
  slug: string;
  description: string;
  crs: string;
  lengthUnit: LengthUnit;
  grid: ProjectGrid;
  minTeamSize: number;
  hasWorkLimit: boolean;
  /** IANA zone the project's local days and times are read in. */
  timeZone: string;
}

export function presentProject(project: Project): ProjectView {
  return {
    id: project.id,
    name: project.name,
    slug: project.slug,
    description: project.description,
    crs: project.crs,
    lengthUnit: project.lengthUnit,
    grid: projectGrid(project),
    minTeamSize: project.minTeamSize,
    hasWorkLimit: Boolean(project.workLimitGeoJson),
    timeZone: project.timeZone,
  };
}

export async function findProject(projectId: number): Promise<Project | null> {
  return Project.findByPk(projectId);
}
