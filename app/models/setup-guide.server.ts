import { Op } from "sequelize";
import type { ProjectView } from "~/lib/auth/project-view.server";
import { DiveTeam, Invitation, Membership } from "~/lib/db.server";
import { computeSetupProgress, type SetupProgress } from "../../shared/setup-steps";
import { getProjectSettings } from "./project-setup.server";

/**
 * The "Set up this project" guide's state: read from what the project holds (its settings, dive
 * teams, members, open invitations and surveys), never from a stored flag, so it is right however
 * the project was set up (the guide, the settings page, the API or the seeder).
 */
export async function loadSetupProgress(project: ProjectView, now = new Date()): Promise<SetupProgress> {
  const [settings, activeTeamCount, memberCount, openInvitationCount] = await Promise.all([
    getProjectSettings(project),
    DiveTeam.count({ where: { projectId: project.id, retiredAt: null } }),
    Membership.count({ where: { projectId: project.id } }),
    Invitation.count({ where: { projectId: project.id, acceptedAt: null, revokedAt: null, expiresAt: { [Op.gt]: now } } }),
  ]);
  return computeSetupProgress({
    agency: settings.agency,
    permitNumbers: settings.permitNumbers,
    crs: settings.crs || null,
    hasWorkLimit: settings.workLimit !== null,
    cellCount: settings.cellCount,
    zoneCount: settings.zones.length,
    hasWorkDay: settings.workDay !== null,
    hasEmergencyInfo: settings.emergency !== null,
    activeTeamCount,
    memberCount,
    openInvitationCount,
    surveyCount: settings.surveyCount,
  });
}
