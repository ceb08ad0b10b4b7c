import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { SURVEYS, WORK_LIMIT, ZONES } from "../../sample-data/scenario";
import { AuditEvent, CellResult, Project, ProjectSettingsVersion, Zone } from "~/lib/db.server";
import { createApiToken } from "~/lib/auth/api-token.server";
import { findProject, presentProject } from "~/lib/auth/project-view.server";
import { loadProgress } from "~/models/progress.server";
import { projectGrid } from "~/lib/engine/project-geometry.server";
import { createProject, createZoneFromCells } from "~/models/project-setup.server";
import * as settingsPage from "~/routes/projects.$projectId.settings";
import { cellCentroid, cellIndex, cellLabel, cellRowCol, createCellGrid, parseCellLabel } from "../../shared/grid/cell-grid";
import { isInsideWorkLimit, type Position, type ProjectedMultiPolygon } from "../../shared/grid/work-limit";
import { zoneCells } from "../../shared/volumes/rollup";
import { importDemoSurveys, projectCrs } from "./import-helpers";
import { finishedRecompute } from "./recompute-helpers";
import { makeUser, requestAs } from "./helpers";

// Zones from a file of polygons and from cells selected on the map: both through the settings
// page's action and the one project setup service (the same checks, settings version and audit
// entry as a zone drawn on the map), so every cell inside the work limit stays in exactly one
// zone or Unzoned.

process.env.UPLOAD_DIR = mkdtempSync(join(tmpdir(), "firmsand-zones-from-cells-"));
afterAll(closeSequelize);

let manager: Awaited<ReturnType<typeof makeUser>>;
let projectId: number;

beforeAll(async () => {
  manager = await makeUser("zone-filer", { isSiteAdmin: true });
  ({ id: projectId } = await createProject(manager, {
    name: `Zones from files ${Date.now().toString(36)}`, crs: "EPSG:2237", lengthUnit: "us-ft", timeZone: "America/New_York",
    workLimit: WORK_LIMIT, grid: { cellSize: 20 },
  }));
});

type Result = { data: { errors: Record<string, string>; notice: string | null; problems?: string[]; zonesFile?: settingsPage.ZonesFilePreview }; init: { status?: number } | null };

async function post(fields: Record<string, string | File>): Promise<Result> {
  const form = new FormData();
  for (const [name, value] of Object.entries(fields)) form.set(name, value);
  const request = await requestAs(manager.id, `/projects/${projectId}/settings`, { method: "POST", body: form });
  return (await settingsPage.action({ request, params: { projectId: String(projectId) }, context: {} } as never)) as unknown as Result;
}

const zoneRows = async () => (await Zone.findAll({ where: { projectId }, order: [["sortOrder", "ASC"]] })).map((zone) => ({ id: zone.id, name: zone.name, geometry: JSON.parse(zone.polygonGeoJson) }));
const [vent, upper, lower] = ["Vent basin", "Upper run", "Lower run"].map((name) => ZONES.find((zone) => zone.name === name)!.polygon);
/** The outline's first two and last two corners in a bow-tie order (1, n−1, 2, n), as a self-crossing ring. */
const bowTie = (polygon: typeof vent) => {
  const corners = polygon.coordinates[0].slice(0, -1);
  const [a, b, c, d] = [corners[0], corners[1], corners[corners.length - 2], corners[corners.length - 1]];
  return { type: "Polygon", coordinates: [[a, c, b, d, a]] };
};

describe("zones from a file", () => {
  it("previews one zone per feature, named from its name property or asked for; a feature that is no polygon or crosses itself is named with its problem", async () => {
    const file = new File([JSON.stringify({
      type: "FeatureCollection",
      features: [
        { type: "Feature", properties: { NAME: "Vent basin" }, geometry: vent },
        { type: "Feature", properties: { depth: 4 }, geometry: upper },
        { type: "Feature", properties: { name: "Buoy" }, geometry: { type: "Point", coordinates: vent.coordinates[0][0] } },
        { type: "Feature", properties: { zone: "Twisted" }, geometry: bowTie(upper) },
      ],
    })], "zones.geojson", { type: "application/geo+json" });
    const preview = await post({ intent: "zones-file-preview", file });
    expect(preview.data.errors).toEqual({});
    const read = preview.data.zonesFile!;
    expect(read.format).toBe("GeoJSON");
    expect(read.problems).toEqual(['Feature 3 ("Buoy") is a Point, not a polygon: a zone is a closed outline.']);
    expect(read.zones.map((zone) => [zone.source, zone.name, zone.problems.length])).toEqual([["feature 1", "Vent basin", 0], ["feature 2", null, 0], ["feature 4", "Twisted", 1]]);
    expect(read.zones[2].problems[0]).toMatch(/^Feature 4 \("Twisted"\) polygon 1, ring 1 \(the outline\) crosses itself near vertex \d+\.$/);
    expect(read.zones[0].area).toBeGreaterThan(0);
    expect(await zoneRows()).toEqual([]); // a preview stores nothing
  });

  it("reads a CSV of outlines in the project's CRS as one zone per outline (the work limit's reader)", async () => {
    const crs = projectCrs();
    const rows = ["polygon,easting,northing"];
    for (const [key, polygon] of [["A", vent], ["B", lower]] as const) for (const [lon, lat] of polygon.coordinates[0].slice(0, -1)) rows.push(`${key},${crs.fromLonLat(lon, lat).map((value) => value.toFixed(3)).join(",")}`);
    const preview = await post({ intent: "zones-file-preview", file: new File([rows.join("\n")], "zones.csv", { type: "text/csv" }) });
    const read = preview.data.zonesFile!;
    expect(read.format).toBe("CSV");
    expect(read.zones.map((zone) => [zone.source, zone.name, zone.problems])).toEqual([["polygon 1", null, []], ["polygon 2", null, []]]);
  });

  it("refuses an empty file and a zone reaching outside the work limit, naming the file or the feature", async () => {
    const empty = await post({ intent: "zones-file-preview", file: new File([""], "nothing.kml") });
    expect(empty.init?.status).toBe(400);
    expect(empty.data.errors.zonesFile).toBe("nothing.kml is empty (0 bytes).");
    const moved = { type: "Polygon", coordinates: [upper.coordinates[0].map(([lon, lat]) => [lon + 0.002, lat])] };
    const outside = await post({ intent: "zones-file-preview", file: new File([JSON.stringify({ type: "Feature", properties: { Name: "Drifted" }, geometry: moved })], "drifted.geojson") });
    expect(outside.data.zonesFile!.zones[0].problems[0]).toMatch(/^Feature 1 \("Drifted"\) must lie inside the work limit: about [\d,]+ ft² of it lies outside/);
  });

  it("adds the named zones through the zones service: stored, a settings version and an audit entry", async () => {
    const versions = await ProjectSettingsVersion.count({ where: { projectId } });
    const saved = await post({ intent: "zones-file-save", mode: "add", zones: JSON.stringify([{ source: "feature 1", name: "Vent basin", geometry: vent }, { source: "feature 2", name: "Upper run", geometry: upper }]) });
    expect(saved.data.errors).toEqual({});
    expect(saved.data.notice).toBe("2 zones added from the file.");
    const rows = await zoneRows();
    expect(rows.map((zone) => zone.name)).toEqual(["Vent basin", "Upper run"]);
    expect(rows[0].geometry).toEqual(vent); // computed: lon/lat in, lon/lat stored as given
    expect(await ProjectSettingsVersion.count({ where: { projectId } })).toBe(versions + 1);
    const latest = await ProjectSettingsVersion.findOne({ where: { projectId }, order: [["id", "DESC"]] });
    expect(latest!.changedParts).toContain("zones");
    const audit = await AuditEvent.findOne({ where: { projectId, action: "project-settings-changed" }, order: [["id", "DESC"]] });
    expect((audit?.detail as { after: { zones: string[] } }).after.zones).toEqual(["Vent basin", "Upper run"]);
  });

  it("names the file's feature when a zone is refused on saving (a name taken, a name missing); nothing is saved", async () => {
    const taken = await post({ intent: "zones-file-save", mode: "add", zones: JSON.stringify([{ source: "feature 1", name: "Lower run", geometry: lower }, { source: "feature 2", name: "vent basin", geometry: lower }]) });
    expect(taken.init?.status).toBe(400);
    expect(taken.data.problems).toEqual(['Feature 2: Zone "vent basin" is named twice.']);
    const unnamed = await post({ intent: "zones-file-save", mode: "replace", zones: JSON.stringify([{ source: "feature 1", name: "Lower run", geometry: lower }, { source: "polygon 2", name: " ", geometry: lower }]) });
    expect(unnamed.init?.status).toBe(400);
    expect(unnamed.data.problems).toEqual(["Polygon 2: A zone needs a name"]);
    expect((await zoneRows()).map((zone) => zone.name)).toEqual(["Vent basin", "Upper run"]);
  });

  it("replaces the zones: one of the same name keeps its id, the others go", async () => {
    const before = await zoneRows();
    const saved = await post({ intent: "zones-file-save", mode: "replace", zones: JSON.stringify([{ source: "feature 1", name: "Upper run", geometry: upper }, { source: "feature 2", name: "Lower run", geometry: lower }]) });
    expect(saved.data.notice).toBe("The zones replaced by the file's 2.");
    const after = await zoneRows();
    expect(after.map((zone) => zone.name)).toEqual(["Upper run", "Lower run"]);
    expect(after[0].id).toBe(before.find((zone) => zone.name === "Upper run")!.id);
  });
});

describe("a zone made of cells selected on the map", () => {
  let blockLabels: string[] = [];
  async function grid() {
    const project = (await Project.findByPk(projectId))!;
    const crs = projectCrs();
    const limit: ProjectedMultiPolygon = [WORK_LIMIT.coordinates.map((ring) => ring.map(([lon, lat]) => crs.fromLonLat(lon, lat) as Position))];
    return { cellGrid: createCellGrid(limit, projectGrid(project)), limit, crs };
  }

  it("is the union of the cells' squares inside the work limit, holding exactly those cells (the zone membership rule), through the zones service", async () => {
    await post({ intent: "zones-file-save", mode: "replace", zones: JSON.stringify([{ source: "feature 1", name: "Upper run", geometry: upper }]) });
    const { cellGrid, limit, crs } = await grid();
    // A block of 3 × 2 cells whose centres lie inside the limit and inside no zone yet, and one cell beside it.
    let chosen: number[] = [];
    for (let index = 0; index < cellGrid.cols * cellGrid.rows && chosen.length === 0; index++) {
      const { row, col } = cellRowCol(cellGrid, index);
      const block = [0, 1, 2].flatMap((dc) => [0, 1].map((dr) => ({ row: row + dr, col: col + dc })));
      const fits = block.every((cell) => {
        const [x, y] = cellCentroid(cellGrid, cell.row, cell.col);
        const square = [[0, 0], [1, 0], [1, 1], [0, 1]].map(([du, dv]) => cellCentroid(cellGrid, cell.row - 0.5 + dv, cell.col - 0.5 + du));
        return cellIndex(cellGrid, cell.row, cell.col) >= 0 && square.every(([sx, sy]) => isInsideWorkLimit(limit, sx, sy)) && isInsideWorkLimit(limit, x, y);
      });
      if (fits) chosen = block.map((cell) => cellIndex(cellGrid, cell.row, cell.col));
    }
    expect(chosen).toHaveLength(6);
    const labels = chosen.map((index) => { const { row, col } = cellRowCol(cellGrid, index); return cellLabel(row, col); });
    const versions = await ProjectSettingsVersion.count({ where: { projectId } });
    blockLabels = labels;
    const saved = await post({ intent: "zone-from-cells", name: "Dredge block 1", cells: labels.join(", ") });
    expect(saved.data.errors).toEqual({});
    expect(saved.data.notice).toMatch(/^Zone "Dredge block 1" made of 6 cells\./);
    const zone = (await zoneRows()).find((row) => row.name === "Dredge block 1")!;
    expect(zone).toBeDefined();
    // invariant: the stored outline, read back in the project's CRS, holds exactly the chosen cells by their centres.
    const polygons = (zone.geometry.type === "Polygon" ? [zone.geometry.coordinates] : zone.geometry.coordinates) as Position[][][];
    const projected = polygons.map((rings) => rings.map((ring) => ring.map(([lon, lat]) => crs.fromLonLat(lon, lat) as Position)));
    expect([...zoneCells(cellGrid, { id: "z", polygon: projected })].sort((a, b) => a - b)).toEqual([...chosen].sort((a, b) => a - b));
    expect(await ProjectSettingsVersion.count({ where: { projectId } })).toBe(versions + 1);
    const audit = await AuditEvent.findOne({ where: { projectId, action: "project-settings-changed" }, order: [["id", "DESC"]] });
    expect((audit?.detail as { after: { zones: string[] } }).after.zones).toEqual(["Upper run", "Dredge block 1"]);
  });

  it("clips an edge cell to the work limit and says when its centre lies outside (it cannot be held by its centre)", async () => {
    const { cellGrid, limit } = await grid();
    // A cell whose centre lies outside the limit while part of its square lies inside.
    let edge: string | null = null;
    for (let index = 0; index < cellGrid.cols * cellGrid.rows && !edge; index++) {
      const { row, col } = cellRowCol(cellGrid, index);
      const [x, y] = cellCentroid(cellGrid, row, col);
      const corners = [[0, 0], [1, 0], [1, 1], [0, 1]].map(([du, dv]) => cellCentroid(cellGrid, row - 0.5 + dv, col - 0.5 + du));
      if (!isInsideWorkLimit(limit, x, y) && corners.some(([cx, cy]) => isInsideWorkLimit(limit, cx, cy))) edge = cellLabel(row, col);
    }
    expect(edge).not.toBeNull();
    const saved = await post({ intent: "zone-from-cells", name: "Edge sliver", cells: edge! });
    expect(saved.data.errors).toEqual({});
    expect(saved.data.notice).toContain(`${edge} has its centre outside the work limit: a zone holds a cell by its centre, so it stays where it was (Unzoned or another zone).`);
  });

  it("refuses labels that are not cells of the grid, and a name already taken, storing nothing", async () => {
    const before = await zoneRows();
    const unknown = await post({ intent: "zone-from-cells", name: "Nowhere", cells: "ZZZZ9999, Q" });
    expect(unknown.init?.status).toBe(400);
    expect(unknown.data.errors.cells).toBe("ZZZZ9999, Q are not cells of this project's grid (labels such as C7).");
    const taken = await post({ intent: "zone-from-cells", name: "upper run", cells: blockLabels.join(",") });
    expect(taken.init?.status).toBe(400);
    expect(taken.data.errors.name).toBe('Zone "upper run" is named twice.');
    expect(await zoneRows()).toEqual(before);
  });
});

describe("a zone made of cells on a project with a survey", () => {
  let surveyed: number;
  let surveyor: Awaited<ReturnType<typeof makeUser>>;

  beforeAll(async () => {
    surveyor = await makeUser("zone-cells-manager", { isSiteAdmin: true });
    surveyed = (await createProject(surveyor, {
      name: `Zones from cells, surveyed ${Date.now().toString(36)}`, crs: "EPSG:2237", lengthUnit: "us-ft", timeZone: "America/New_York",
      workLimit: WORK_LIMIT, grid: { cellSize: 20 }, zones: [{ name: "Upper run", geometry: upper }],
    })).id;
    await importDemoSurveys(surveyed, surveyor.id, SURVEYS.filter((survey) => survey.key === "baseline"));
  }, 120_000);

  it("recomputes like any zone edit: the engine puts exactly the chosen cells in the new zone, every cell in one zone or Unzoned, and the zone rows add up to the project", async () => {
    const view = presentProject((await findProject(surveyed))!);
    const cells = await CellResult.findAll({ where: { projectId: surveyed }, attributes: ["label", "zoneId", "areaInLimit"] });
    const upperId = (await Zone.findOne({ where: { projectId: surveyed, name: "Upper run" } }))!.id;
    // Four cells no zone holds yet, whole squares inside the limit (they keep their centre inside).
    const { cellGrid, limit } = await (async () => {
      const project = (await Project.findByPk(surveyed))!;
      const crs = projectCrs();
      const projected: ProjectedMultiPolygon = [WORK_LIMIT.coordinates.map((ring) => ring.map(([lon, lat]) => crs.fromLonLat(lon, lat) as Position))];
      return { cellGrid: createCellGrid(projected, projectGrid(project)), limit: projected };
    })();
    const whole = (label: string) => {
      const { row, col } = parseCellLabel(label)!;
      return [[0, 0], [1, 0], [1, 1], [0, 1]].every(([du, dv]) => isInsideWorkLimit(limit, ...cellCentroid(cellGrid, row - 0.5 + dv, col - 0.5 + du)));
    };
    const chosen = cells.filter((cell) => cell.zoneId === null && whole(cell.label)).slice(0, 4).map((cell) => cell.label);
    expect(chosen).toHaveLength(4);
    const made = await createZoneFromCells(view, surveyor, { name: "Four cells", cells: chosen });
    expect(made.recompute).not.toBeNull();
    await finishedRecompute((await createApiToken(surveyor, "tests")).token, surveyed, made.recompute!.jobId);
    const fourId = (await Zone.findOne({ where: { projectId: surveyed, name: "Four cells" } }))!.id;
    const after = await CellResult.findAll({ where: { projectId: surveyed }, attributes: ["label", "zoneId", "areaInLimit"] });
    expect(after.filter((cell) => cell.zoneId === fourId).map((cell) => cell.label).sort()).toEqual([...chosen].sort());
    // The rest kept their zone: the upper run's cells, and Unzoned for the others.
    const before = new Map(cells.map((cell) => [cell.label, cell.zoneId]));
    for (const cell of after) if (!chosen.includes(cell.label)) expect(cell.zoneId, cell.label).toBe(before.get(cell.label));
    expect(after.some((cell) => cell.zoneId === upperId)).toBe(true);
    // invariant: the zone rows (Unzoned among them) add up to the project, to the cent of a cubic yard.
    const progress = await loadProgress(view);
    const sum = (key: "cells" | "plannedVolume" | "remainingVolume") => progress.zones.reduce((total, zone) => total + (zone[key] as number), 0);
    expect(sum("cells")).toBe(progress.total.cells);
    expect(Math.abs(sum("plannedVolume") - (progress.total.plannedVolume as number))).toBeLessThan(0.005);
    expect(Math.abs(sum("remainingVolume") - (progress.total.remainingVolume as number))).toBeLessThan(0.005);
    expect(progress.zones.map((zone) => zone.name)).toEqual(["Upper run", "Four cells", "Unzoned"]);
  }, 120_000);
});
