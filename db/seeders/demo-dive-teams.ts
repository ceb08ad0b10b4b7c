import { DIVE_TEAMS, PROJECT } from "../../sample-data/scenario";
import { DiveTeam, Project, initModels, type DiveTeamMember } from "../models";

/**
 * The demo project's dive teams (sample-data/scenario.ts) with invented crews. Team Gar is one
 * short of the demo's minimum team size on purpose, so the plan screens show the flag.
 */
const CREWS: Record<string, DiveTeamMember[]> = {
  "Team Limpkin": [
    { name: "Odessa Marchetti", email: "limpkin.diver@example.org", duty: "diver" },
    { name: "Caspian Holloway", email: "limpkin.tender@example.org", duty: "tender" },
    { name: "Juniper Adeyemi", email: "limpkin.standby@example.org", duty: "standby diver" },
  ],
  "Team Gar": [
    { name: "Florian Bexley", email: "gar.diver@example.org", duty: "diver" },
    { name: "Rosalind Ituarte", email: "gar.tender@example.org", duty: "tender" },
  ],
};

/** Adds the demo dive teams when the demo project has none. Running it again changes nothing. */
export async function seedDemoDiveTeams(): Promise<"seeded" | "skipped"> {
  initModels();
  const project = await Project.findOne({ where: { slug: PROJECT.slug } });
  if (!project || (await DiveTeam.count({ where: { projectId: project.id } })) > 0) return "skipped";
  for (const [index, team] of DIVE_TEAMS.entries()) {
    await DiveTeam.create({
      projectId: project.id,
      name: team.name,
      station: team.station,
      hoses: team.hoses.map((hose) => hose.name),
      members: CREWS[team.name] ?? [],
      sortOrder: index + 1,
    });
  }
  return "seeded";
}
