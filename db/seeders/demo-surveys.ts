// The demo's surveys go in through the same import path a technician uses (stage the file,
// analyse, one-transaction commit with recomputed statistics), so the demo proves the import.
import { createReadStream } from "node:fs";
import { rm } from "node:fs/promises";
import { dirname, join } from "node:path";
import { Readable } from "node:stream";
import { fileURLToPath } from "node:url";
import { GRID, PROJECT, SURVEYS } from "../../sample-data/scenario";
import type { ImportOptions } from "../../app/lib/import/import-options";
import { Project, User } from "../models";

const DEMO_DIR = join(dirname(fileURLToPath(import.meta.url)), "..", "..", "sample-data", "demo");

export interface SeededSurvey {
  key: string;
  surveyId: number;
  soundings: number;
  seconds: number;
}

/** The import options a demo survey is uploaded with (the seed's, and the tests' that import demo files). */
export function demoImportOptions(survey: (typeof SURVEYS)[number], extra: Partial<ImportOptions> = {}): ImportOptions {
  return {
    kind: survey.kind,
    surveyedOn: survey.surveyedOn,
    timeZone: PROJECT.timeZone,
    waterSurfaceElevation: survey.waterSurfaceElevationFt,
    fileHasElevations: false,
    datum: PROJECT.verticalDatum,
    crs: PROJECT.crs,
    lengthUnit: PROJECT.lengthUnit,
    surveyOrder: GRID.surveyOrder,
    ...extra,
  };
}

export async function seedDemoSurveys(log: (message: string) => void = () => undefined): Promise<SeededSurvey[]> {
  // Imported lazily: the import service pulls in the app's modules, which the rest of the seed does not need.
  const { writeStagedFile } = await import("../../app/lib/import/stage-upload.server");
  const { importSurveyFile } = await import("../../app/lib/import/import-service.server");
  const project = await Project.findOne({ where: { slug: PROJECT.slug } });
  if (!project) throw new Error(`the demo project ${PROJECT.slug} is missing`);
  const surveyor = await User.findOne({ where: { email: "surveyor@example.org" } });
  const seeded: SeededSurvey[] = [];
  for (const survey of SURVEYS) {
    const started = performance.now();
    const source = join(DEMO_DIR, survey.fileName);
    const staged = await writeStagedFile(Readable.toWeb(createReadStream(source)) as ReadableStream<Uint8Array>, survey.fileName);
    const outcome = await importSurveyFile({
      projectId: project.id,
      userId: surveyor?.id ?? null,
      staged,
      options: demoImportOptions(survey),
      // The scenario puts three progress-2 soundings just outside the limit on purpose; the demo keeps them, as a technician may.
      choices: { excludeRows: [], excludeErrorRows: false, outside: "keep", acceptSameFile: false },
    });
    await rm(staged.path, { force: true });
    if (!outcome.ok) throw new Error(`demo survey ${survey.fileName} was refused: ${outcome.preview.blockers.join(" ")} ${outcome.preview.fileProblems.join(" ")}`);
    const seconds = (performance.now() - started) / 1000;
    seeded.push({ key: survey.key, surveyId: outcome.committed.surveyId, soundings: outcome.committed.soundingCount, seconds });
    log(`[firmsand] demo survey ${survey.fileName}: ${outcome.committed.soundingCount} soundings imported in ${seconds.toFixed(1)} s`);
  }
  return seeded;
}
