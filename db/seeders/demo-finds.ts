import { mkdir, rm, writeFile } from "node:fs/promises";
import { join } from "node:path";
import { randomBytes } from "node:crypto";
import sharp from "sharp";
import { DEMO_BASKETS, DEMO_FINDS, type DemoFind } from "../../sample-data/finds";
import { CellResult, Dive, Find, Hold, HoldNotice, Project, User, Zone } from "../models";
import { DEMO_PROJECT } from "./demo-scenario";

/**
 * The demo's finds (sample-data/finds.ts), logged through the same services as the API and the
 * pages: catalogue numbers, holds, a generated stand-in photo each (a flat card with a scale bar
 * and the field tag, made with sharp: no real object is shown), custody chains, statuses, the
 * agencies told and the holds lifted. Runs when the demo project has no finds.
 */
export async function seedDemoFinds(): Promise<boolean> {
  const project = await Project.findOne({ where: { slug: DEMO_PROJECT.slug } });
  if (!project || (await Find.count({ where: { projectId: project.id } })) > 0) return false;
  const monitor = await User.findOne({ where: { email: "monitor@example.org" } });
  if (!monitor) return false;
  const { presentProject } = await import("../../app/lib/auth/project-view.server");
  const { presentUser } = await import("../../app/lib/auth/users.server");
  const { addFindPhoto, findInputSchema, logFind, recordCustody, setFindStatus } = await import("../../app/models/finds.server");
  const { liftHold, recordHoldNotice } = await import("../../app/models/holds.server");
  const { stagingDirectory } = await import("../../app/lib/import/stage-upload.server");
  const { localDateTimeToInstant } = await import("../../shared/finds/finds");
  const { cellLabel } = await import("../../shared/grid/cell-grid");
  const view = presentProject(project);
  const user = presentUser(monitor);
  const at = (local: string) => localDateTimeToInstant(local, project.timeZone)!.toISOString();

  const cellFor = async (demo: DemoFind): Promise<string> => {
    const zone = await Zone.findOne({ where: { projectId: project.id, name: demo.zone } });
    const cells = await CellResult.findAll({ where: { projectId: project.id, ...(zone ? { zoneId: zone.id } : {}) }, order: [["row", "ASC"], ["col", "ASC"]] });
    const cell = cells[Math.min(demo.cellRank, cells.length - 1)];
    return cellLabel(cell.row, cell.col);
  };

  for (const demo of DEMO_FINDS) {
    const input = findInputSchema.parse({
      category: demo.category, description: demo.description, material: demo.material, count: demo.count, taxon: demo.taxon, element: demo.element,
      condition: demo.condition, cell: await cellFor(demo), depthBelowSurface: demo.depthBelowSurfaceFt, depthInMuck: demo.depthInMuckFt,
      finder: demo.finder, foundAt: at(demo.foundAtLocal), fieldTag: demo.fieldTag,
    });
    const logged = await logFind(view, user, input);

    const staging = stagingDirectory();
    await mkdir(staging, { recursive: true });
    const path = join(staging, `demo-${randomBytes(6).toString("hex")}.jpg`);
    await writeFile(path, await standInPhoto(demo));
    try {
      await addFindPhoto(view, user, logged.id, { path, fileName: `${demo.fieldTag}.jpg`, size: 0, sha256: "" });
    } finally {
      await rm(path, { force: true });
    }

    for (const handover of demo.custody) {
      await recordCustody(view, user, logged.id, { fromName: handover.from, toName: handover.to, place: handover.place, purpose: handover.purpose, handedAt: at(handover.atLocal), receiverSignature: handover.to, note: null });
    }
    if (demo.status) await setFindStatus(view, user, logged.id, { status: demo.status.status, accessionNumber: demo.status.accessionNumber ?? null, note: demo.status.note ?? null });
    if (logged.hold && demo.hold) {
      const notices = await HoldNotice.findAll({ where: { holdId: logged.hold.id } });
      for (const notice of notices) await recordHoldNotice(view, user, logged.hold.id, { agency: notice.agency, toldAt: at(demo.hold.toldAtLocal), note: "by phone, then e-mail" });
      await liftHold(view, user, logged.hold.id, { authorisedBy: demo.hold.liftedBy, note: demo.hold.note });
    }
  }
  return (await Hold.count({ where: { projectId: project.id } })) > 0;
}

/**
 * The demo's basket loads (sample-data/finds.ts) on the demo dives, logged by the monitor through
 * the same service as the basket page and the API, each with its dive's team and first cell. Runs
 * when the demo project has dives and no basket lines yet.
 */
export async function seedDemoBaskets(): Promise<boolean> {
  const project = await Project.findOne({ where: { slug: DEMO_PROJECT.slug } });
  if (!project || (await Find.count({ where: { projectId: project.id, fromBasket: true } })) > 0) return false;
  const monitor = await User.findOne({ where: { email: "monitor@example.org" } });
  if (!monitor) return false;
  const { presentProject } = await import("../../app/lib/auth/project-view.server");
  const { presentUser } = await import("../../app/lib/auth/users.server");
  const { basketLoadInputSchema, logBasketLoad } = await import("../../app/models/finds.server");
  const { localDateTimeToInstant } = await import("../../shared/finds/finds");
  const view = presentProject(project);
  const user = presentUser(monitor);
  let logged = false;
  for (const basket of DEMO_BASKETS) {
    const dive = await Dive.findOne({ where: { projectId: project.id, diveDate: basket.diveDate, diverName: basket.diver }, include: [{ association: "cells", attributes: ["label"] }] });
    if (!dive) continue;
    // A refusal throws (a typed error naming the line), which fails the seed loudly.
    await logBasketLoad(view, user, basketLoadInputSchema.parse({
      lines: basket.lines, diveId: dive.id, cell: dive.cells?.[0]?.label ?? null, depthBelowSurface: basket.depthBelowSurfaceFt,
      foundAt: localDateTimeToInstant(basket.broughtUpAtLocal, project.timeZone)!.toISOString(), finder: basket.diver, fieldTag: basket.fieldTag,
    }));
    logged = true;
  }
  return logged;
}

/** A flat card in the find's colour with a 10-unit scale bar and the field tag: a stand-in, not a picture of anything. */
async function standInPhoto(demo: DemoFind): Promise<Buffer> {
  const width = 960;
  const height = 720;
  const ticks = Array.from({ length: 11 }, (_, index) => `<rect x="${80 + index * 40}" y="600" width="2" height="${index % 5 === 0 ? 30 : 18}" fill="#111"/>`).join("");
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}">
    <rect width="100%" height="100%" fill="#e8e4da"/>
    <ellipse cx="480" cy="330" rx="220" ry="140" fill="${demo.photoColour}"/>
    <rect x="80" y="630" width="402" height="8" fill="#111"/>${ticks}
    <rect x="640" y="580" width="240" height="80" fill="#fff" stroke="#111" stroke-width="3"/>
    <text x="760" y="632" font-family="DejaVu Sans, sans-serif" font-size="30" text-anchor="middle" fill="#111">${demo.fieldTag}</text>
  </svg>`;
  return sharp(Buffer.from(svg)).jpeg({ quality: 85 }).toBuffer();
}
