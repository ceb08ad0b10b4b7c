import { DEMO_CAKE_SOLIDS_BY_WEIGHT, DEMO_HAUL_SITES, DEMO_JAR_TESTS, DEMO_SAMPLES, DEMO_SOLIDS_SPECIFIC_GRAVITY, DEMO_TUBE_NEAR_CAPACITY_SHARE, DEMO_TUBES, demoDewatering } from "../../sample-data/dewatering";
import { PROJECT, VENT_LON_LAT } from "../../sample-data/scenario";
import { createCrs } from "../../shared/crs";
import { DewateringShift, Project, User, initModels } from "../models";

/**
 * The demo's dewatering records (sample-data/dewatering.ts) through the same services as the
 * pages and the API: settings, jar tests, sites, tubes, shifts (which fill the tubes), tube
 * statuses, haul tickets and the two lab samples. Added when the demo project has no shifts yet.
 */
export async function seedDemoDewatering(): Promise<boolean> {
  initModels();
  const project = await Project.findOne({ where: { slug: PROJECT.slug } });
  if (!project || (await DewateringShift.count({ where: { projectId: project.id } })) > 0) return false;
  const operator = await User.findOne({ where: { email: "dewatering@example.org" } });
  const manager = await User.findOne({ where: { email: "manager@example.org" } });
  const monitor = await User.findOne({ where: { email: "monitor@example.org" } });
  if (!operator || !manager || !monitor) return false;
  // Imported lazily: they pull in the app's modules.
  const dewatering = await import("../../app/models/dewatering.server");
  const hauls = await import("../../app/models/hauls.server");
  const samples = await import("../../app/models/sediment-samples.server");
  const jarTests = await import("../../app/models/jar-tests.server");
  const { presentProject } = await import("../../app/lib/auth/project-view.server");
  const { presentUser } = await import("../../app/lib/auth/users.server");
  const view = presentProject(project);
  const [operatorView, managerView, monitorView] = [operator, manager, monitor].map(presentUser);
  // A refusal throws (a typed error naming the problem), which fails the seed loudly.
  await dewatering.updateDewateringSettings(view, managerView, { solidsSpecificGravity: DEMO_SOLIDS_SPECIFIC_GRAVITY, cakeSolidsByWeight: DEMO_CAKE_SOLIDS_BY_WEIGHT, tubeNearCapacityShare: DEMO_TUBE_NEAR_CAPACITY_SHARE });
  for (const test of DEMO_JAR_TESTS) await jarTests.recordJarTest(view, operatorView, jarTests.jarTestInputSchema.parse(test));
  for (const site of DEMO_HAUL_SITES) await hauls.addHaulSite(view, managerView, site);
  const tubeIds = new Map<string, number>();
  const { resolveCrsDefinition } = await import("../../app/lib/geo/epsg.server");
  const [ventX, ventY] = createCrs(resolveCrsDefinition(project.crs).definition).fromLonLat(...VENT_LON_LAT);
  for (const tube of DEMO_TUBES) {
    const position = { x: ventX + tube.laydown.eastFt, y: ventY + tube.laydown.northFt };
    const registered = await dewatering.registerTube(view, operatorView, dewatering.tubeInputSchema.parse({ ...tube, status: "filling", position }));
    tubeIds.set(tube.name, registered.id);
  }
  const generated = demoDewatering();
  for (const shift of generated.shifts) await dewatering.recordShift(view, operatorView, dewatering.shiftInputSchema.parse(shift));
  for (const tube of DEMO_TUBES) await dewatering.changeTube(view, operatorView, tubeIds.get(tube.name)!, { status: tube.finalStatus });
  for (const haul of generated.hauls) await hauls.recordHaul(view, operatorView, hauls.haulInputSchema.parse(haul));
  for (const sample of DEMO_SAMPLES) await samples.recordSample(view, monitorView, samples.sampleInputSchema.parse(sample));
  return true;
}
