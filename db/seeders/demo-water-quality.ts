import { MonitoringStation, Project, User } from "../models";
import { buildDemoWaterQuality, recentDemoSightings } from "../../sample-data/water-quality";
import { DEMO_PROJECT } from "./demo-scenario";

/**
 * Seeds the demo's invented water-quality record (stations, the rule, two weeks of readings with
 * one exceedance and its resolution, sightings) when the demo project has no stations, through the
 * same services as the API and the pages. The exceedance e-mail is not sent for these past readings.
 * A few sightings are placed in the hours before `seededAtMs` (now), so the map's last day shows some.
 */
export async function seedDemoWaterQuality(seededAtMs = Date.now()): Promise<boolean> {
  const project = await Project.findOne({ where: { slug: DEMO_PROJECT.slug } });
  if (!project || (await MonitoringStation.count({ where: { projectId: project.id } })) > 0) return false;
  const models = await import("../../app/models/water-quality.server");
  const wildlife = await import("../../app/models/wildlife.server");
  const { presentProject } = await import("../../app/lib/auth/project-view.server");
  const { presentUser } = await import("../../app/lib/auth/users.server");
  const manager = await User.findOne({ where: { email: "manager@example.org" } });
  const operator = await User.findOne({ where: { email: "dewatering@example.org" } });
  const monitor = await User.findOne({ where: { email: "monitor@example.org" } });
  if (!manager || !operator || !monitor) return false;
  const view = presentProject(project);
  const demo = buildDemoWaterQuality();
  const managerView = presentUser(manager);
  await models.createRule(view, managerView, models.ruleInputSchema.parse(demo.rule));
  for (const station of demo.stations) await models.createStation(view, managerView, models.stationInputSchema.parse(station));
  let stopWorkId: number | null = null;
  for (const reading of demo.readings) {
    const recorder = presentUser(reading.sampledBy === "Tobias Fennimore" ? monitor : operator);
    const recorded = await models.recordReading(view, recorder, models.readingInputSchema.parse(reading), null, { alert: false });
    stopWorkId ??= recorded.stopWork?.id ?? null;
  }
  if (stopWorkId !== null) {
    await models.recordAgencyNotice(view, presentUser(monitor), stopWorkId, models.agencyNoticeInputSchema.parse(demo.resolution.agencyNotice));
    await models.resumeStopWork(view, presentUser(monitor), stopWorkId, demo.resolution.note, null, { at: new Date(demo.resolution.resumedAt) });
  }
  for (const sighting of [...demo.sightings, ...recentDemoSightings(seededAtMs)]) await wildlife.recordSighting(view, presentUser(operator), wildlife.sightingInputSchema.parse(sighting));
  return true;
}
