import { Op, UniqueConstraintError } from "sequelize";
import { z } from "zod";
import { DEFAULT_JAR_VOLUME_ML, JAR_CLARITIES, JAR_CLARITY_LABELS, jarTestFigures, type JarClarity } from "../../shared/dewatering/jar-test";
import { JarTest, JarTestPhoto, getSequelize } from "~/lib/db.server";
import { NotFoundError } from "~/lib/errors";
import { AUDIT_ACTIONS, recordAudit } from "~/lib/audit/audit.server";
import type { ProjectView } from "~/lib/auth/project-view.server";
import type { UserView } from "~/lib/auth/users.server";
import type { StagedFile } from "~/lib/import/stage-upload.server";
import { keepPhoto, keptPhotoBytes, presentPhoto, type KeptPhoto, type PhotoView } from "~/lib/images/stored-photo.server";
import type { StoredObject } from "~/lib/storage/storage.server";
import type { Transaction } from "sequelize";
import { claimIdempotencyKey } from "~/lib/api/idempotency.server";
import { workDateSchema } from "./assignments.server";
export { jarInputSchema, jarTestInputSchema } from "~/lib/field-records/inputs";
import { jarTestInputSchema } from "~/lib/field-records/inputs";

/**
 * Jar tests: the dewatering operator's bench check of a polymer dose before (or while) it goes on
 * the line. What was set up (product, bench stock, jar size), the raw sample's turbidity, each
 * dosed jar and what it looked like after settling, the dose chosen, and photos of the jars
 * (kept through app/lib/images/stored-photo.server.ts, like every photo). The bench arithmetic is
 * shared/dewatering/jar-test.ts, run on the page as the operator types and here for what is answered.
 */

/** Shown wherever jar tests are recorded or read. */
export const JAR_TEST_CAUTION =
  "Make up and handle the polymer stock as the product's safety data sheet and the site's safety plan say: gloves and eye protection at the bench, and a spill is slick, so clean it up at once. A jar test points to a dose; the product and the dose on the line follow the permit and the approved product list. These figures are aids for the operator, not approval.";

export type JarTestInput = z.infer<typeof jarTestInputSchema>;

export interface JarView {
  doseMgPerL: number;
  settlingMinutes: number;
  turbidityNtu: number | null;
  clarity: JarClarity;
  clarityLabel: string;
  /** Bench stock for the jar, mL. */
  stockMl: number;
  /** Share of the raw turbidity removed (0–1), when both were measured. */
  turbidityRemoval: number | null;
}

export interface JarTestView {
  id: number;
  date: string;
  time: string | null;
  sampleSource: string;
  polymer: { product: string; lot: string | null; benchStockPercent: number };
  jarVolumeMl: number;
  raw: { turbidityNtu: number | null };
  jars: JarView[];
  chosenDoseMgPerL: number | null;
  /** The lowest dose among the clearest jars: a pointer, the choice stays the operator's. */
  clearestAtLowestDose: number | null;
  notes: string;
  photos: PhotoView[];
}

function presentJarTest(test: JarTest): JarTestView {
  const figures = jarTestFigures({ jarVolumeMl: test.jarVolumeMl, benchStockPercent: test.benchStockPercent, rawTurbidityNtu: test.rawTurbidityNtu, jars: test.jars });
  return {
    id: test.id, date: test.testDate, time: test.testTime, sampleSource: test.sampleSource,
    polymer: { product: test.polymerProduct, lot: test.polymerLot, benchStockPercent: test.benchStockPercent },
    jarVolumeMl: test.jarVolumeMl, raw: { turbidityNtu: test.rawTurbidityNtu },
    jars: test.jars.map((jar, index) => ({ ...jar, clarityLabel: JAR_CLARITY_LABELS[jar.clarity], stockMl: figures.jars[index].stockMl, turbidityRemoval: figures.jars[index].removal })),
    chosenDoseMgPerL: test.chosenDoseMgPerL, clearestAtLowestDose: figures.clearestAtLowestDose, notes: test.notes,
    photos: (test.photos ?? []).map(presentPhoto),
  };
}

async function findJarTests(project: ProjectView, where: { id?: number; from?: string; to?: string }): Promise<JarTestView[]> {
  const dates = { ...(where.from ? { [Op.gte]: where.from } : {}), ...(where.to ? { [Op.lte]: where.to } : {}) };
  const tests = await JarTest.findAll({
    where: { projectId: project.id, ...(where.id !== undefined ? { id: where.id } : {}), ...(where.from || where.to ? { testDate: dates } : {}) },
    include: [{ model: JarTestPhoto, as: "photos" }],
    order: [["testDate", "DESC"], ["testTime", "DESC"], ["id", "DESC"], [{ model: JarTestPhoto, as: "photos" }, "id", "ASC"]],
  });
  return tests.map(presentJarTest);
}

export function listJarTests(project: ProjectView, range: { from?: string; to?: string } = {}): Promise<JarTestView[]> {
  return findJarTests(project, range);
}

export async function getJarTest(project: ProjectView, jarTestId: number): Promise<JarTestView> {
  const [test] = await findJarTests(project, { id: jarTestId });
  if (!test) throw new NotFoundError({ field: "jarTestId", message: "There is no such jar test on this project." });
  return test;
}

const photoFolder = (project: ProjectView) => ["projects", project.id, "dewatering", "jar-tests"];

async function createPhotoRow(project: ProjectView, user: UserView, jarTestId: number, photo: KeptPhoto, transaction: Transaction, ip: string | null): Promise<number> {
  const created = await JarTestPhoto.create({ ...photo, jarTestId, projectId: project.id, uploadedById: user.id }, { transaction });
  await recordAudit({ action: AUDIT_ACTIONS.jarTestPhotoAdded, projectId: project.id, userId: user.id, ip, detail: { jarTestId, photoId: created.id, sizeBytes: created.sizeBytes } }, transaction);
  return created.id;
}

/**
 * Records a jar test, with a photo of its jars when one is sent: the photo is checked first, and a
 * refused photo stores nothing of the test either. The same idempotency key again answers the test
 * stored then (`replayed`), so a phone that sends twice records once.
 */
export async function recordJarTest(project: ProjectView, user: UserView, input: JarTestInput, photo: StagedFile | null = null, ip: string | null = null): Promise<{ jarTest: JarTestView; replayed: boolean }> {
  if (input.idempotencyKey) {
    const earlier = await JarTest.findOne({ where: { projectId: project.id, idempotencyKey: input.idempotencyKey }, attributes: ["id"] });
    if (earlier) return { jarTest: await getJarTest(project, earlier.id), replayed: true };
  }
  const write = async (transaction: Transaction, kept: KeptPhoto | null) => {
    const idempotency = await claimIdempotencyKey(transaction);
    const test = await JarTest.create(
      {
        projectId: project.id, testDate: input.date, testTime: input.time || null, sampleSource: input.sampleSource,
        polymerProduct: input.polymer.product, polymerLot: input.polymer.lot || null, benchStockPercent: input.polymer.benchStockPercent,
        jarVolumeMl: input.jarVolumeMl, rawTurbidityNtu: input.raw?.turbidityNtu ?? null,
        jars: input.jars.map((jar) => ({ doseMgPerL: jar.doseMgPerL, settlingMinutes: jar.settlingMinutes, turbidityNtu: jar.turbidityNtu ?? null, clarity: jar.clarity })),
        chosenDoseMgPerL: input.chosenDoseMgPerL ?? null, notes: input.notes, idempotencyKey: input.idempotencyKey || null, recordedById: user.id,
      },
      { transaction },
    );
    await recordAudit({ action: AUDIT_ACTIONS.jarTestRecorded, projectId: project.id, userId: user.id, ip, detail: { date: input.date, product: input.polymer.product, jars: input.jars.length, chosenDoseMgPerL: input.chosenDoseMgPerL ?? null } }, transaction);
    await idempotency.created(test.id);
    if (kept) await createPhotoRow(project, user, test.id, kept, transaction, ip);
    return test.id;
  };
  try {
    const id = photo ? await keepPhoto(photo, photoFolder(project), (kept, transaction) => write(transaction, kept)) : await getSequelize().transaction((transaction) => write(transaction, null));
    return { jarTest: await getJarTest(project, id), replayed: false };
  } catch (error) {
    // Two sends of one key at once: the second answers the first.
    if (error instanceof UniqueConstraintError && input.idempotencyKey) return recordJarTest(project, user, input, null, ip);
    throw error;
  }
}

/** Adds a photo to a jar test from a staged upload (checked and stripped of metadata); NotFoundError when not this project's. */
export async function addJarTestPhoto(project: ProjectView, user: UserView, jarTestId: number, staged: StagedFile, ip: string | null = null): Promise<{ id: number }> {
  const test = await JarTest.findOne({ where: { id: jarTestId, projectId: project.id }, attributes: ["id"] });
  if (!test) throw new NotFoundError({ field: "jarTestId", message: "There is no such jar test on this project." });
  return { id: await keepPhoto(staged, photoFolder(project), async (kept, transaction) => {
    const idempotency = await claimIdempotencyKey(transaction);
    const photoId = await createPhotoRow(project, user, test.id, kept, transaction, ip);
    await idempotency.created(photoId);
    return photoId;
  }) };
}

/** A jar test photo's bytes (or its thumbnail's), after the caller's access to the project was checked. */
export async function jarTestPhotoBytes(project: ProjectView, jarTestId: number, photoId: number, size: "full" | "thumb"): Promise<StoredObject> {
  const photo = await JarTestPhoto.findOne({ where: { id: photoId, jarTestId, projectId: project.id } });
  if (!photo) throw new NotFoundError("There is no such photo of this jar test.");
  return keptPhotoBytes(photo, size);
}
