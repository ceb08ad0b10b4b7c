import type { SurveyOrder } from "../../../shared/qa/tvu";
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
  /** The IHO S-44 order the import offers for a new survey (the project's tolerance). */
  surveyOrder: SurveyOrder;
  hasWorkLimit: boolean;
  /** IANA name: local days (a reading's day, today) are counted in it. */
  timeZone: string;
  /** When the project was archived (ISO 8601); null: open. An archived project is read-only. */
  archivedAt: string | null;
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
    surveyOrder: project.surveyOrder,
    hasWorkLimit: Boolean(project.workLimitGeoJson),
    timeZone: project.timeZone,
    archivedAt: project.archivedAt ? project.archivedAt.toISOString() : null,
  };
}

export async function findProject(projectId: number): Promise<Project | null> {
  return Project.findByPk(projectId);
}
