import { DIVE_TEAMS, PROJECT } from "../../sample-data/scenario";
import { DiveTeam, Project, User, initModels, type DiveTeamMember } from "../models";

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

/**
 * Adds the demo dive teams when the demo project has none, through the teams service as the dive
 * supervisor would. Running it again changes nothing.
 */
export async function seedDemoDiveTeams(): Promise<"seeded" | "skipped"> {
  initModels();
  const project = await Project.findOne({ where: { slug: PROJECT.slug } });
  const supervisor = await User.findOne({ where: { email: "divesup@example.org" } });
  if (!project || !supervisor || (await DiveTeam.count({ where: { projectId: project.id } })) > 0) return "skipped";
  // Imported lazily: they pull in the app's modules.
  const { createDiveTeam, teamInputSchema } = await import("../../app/models/dive-teams.server");
  const { presentProject } = await import("../../app/lib/auth/project-view.server");
  const { presentUser } = await import("../../app/lib/auth/users.server");
  const view = presentProject(project);
  for (const team of DIVE_TEAMS) {
    // The demo project works in US survey feet, so its diameters are in inches.
    const input = teamInputSchema.parse({
      name: team.name, station: team.station, members: CREWS[team.name] ?? [],
      hoses: team.hoses.map((hose) => ({ name: hose.name, diameter: hose.diameterIn })),
      pumps: team.pumps.map((pump) => ({ name: pump.name, diameter: pump.diameterIn })),
    });
    await createDiveTeam(view, presentUser(supervisor), input);
  }
  return "seeded";
}
