import { mkdtempSync, readFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { PROJECT, SURVEYS } from "../../sample-data/scenario";
import { ColumnMapping } from "~/lib/db.server";
import { analyseStagedFile } from "~/lib/import/analyse.server";
import { commitChoicesSchema, importOptionsSchema, type ImportOptions } from "~/lib/import/import-options";
import { loadProjectGeometry } from "~/lib/engine/project-geometry.server";
import { writeStagedFile } from "~/lib/import/stage-upload.server";
import { demoImportOptions } from "../../db/seeders/demo-surveys";
import { DEMO_DIR, FIXTURES, counts, makeDemoSiteProject, postSurvey } from "./import-helpers";

// The analysis of a staged file against a real project in MariaDB: the depth-unit check against
// the project's earlier surveys, and fields the technician marked as not in the file. Staged
// files go to a temporary directory.
process.env.UPLOAD_DIR = mkdtempSync(join(tmpdir(), "firmsand-analyse-test-"));

afterAll(closeSequelize);

const baseline = SURVEYS.find((survey) => survey.key === "baseline")!;
const progress1 = SURVEYS.find((survey) => survey.key === "progress-1")!;

function optionsFor(survey: (typeof SURVEYS)[number], extra: Partial<ImportOptions> = {}): ImportOptions {
  return importOptionsSchema.parse(demoImportOptions(survey, extra));
}

async function analyse(projectId: number, path: string | { name: string; text: string }, options: ImportOptions, choices = {}) {
  const staged = typeof path === "string"
    ? await writeStagedFile(new Blob([readFileSync(path)]).stream(), path.split("/").pop()!)
    : await writeStagedFile(new Blob([path.text]).stream(), path.name);
  return analyseStagedFile({ path: staged.path, sha256: staged.sha256, options, choices: commitChoicesSchema.parse(choices), geometry: await loadProjectGeometry(projectId) });
}

describe("depth-unit check against the project's earlier surveys", () => {
  let site: Awaited<ReturnType<typeof makeDemoSiteProject>>;
  const metresFile = join(FIXTURES, "progress-depths-in-metres.csv");

  beforeAll(async () => {
    site = await makeDemoSiteProject("depth-unit");
  });

  it("has nothing to compare before the first survey", async () => {
    const { preview } = await analyse(site.project.id, metresFile, optionsFor(progress1));
    expect(preview.depthUnit).toBeNull();
  });

  it("says nothing about a good progress pass after the baseline", async () => {
    const stored = await postSurvey(site.project.id, site.tokens.surveyor, { path: join(DEMO_DIR, baseline.fileName) }, {
      kind: baseline.kind, surveyedOn: baseline.surveyedOn, waterSurfaceElevation: String(baseline.waterSurfaceElevationFt), timeZone: PROJECT.timeZone, datum: PROJECT.verticalDatum,
    });
    expect(stored.status).toBe(201);
    const { preview } = await analyse(site.project.id, join(DEMO_DIR, progress1.fileName), optionsFor(progress1), { outside: "keep" });
    expect(preview.depthUnit).toBeNull();
    expect(preview.blockers).toEqual([]);
  });

  it("finds depths in metres declared as feet, blocks until confirmed, and is quiet once the unit is metres", async () => {
    const { preview } = await analyse(site.project.id, metresFile, optionsFor(progress1), { outside: "keep" });
    expect(preview.depthUnit?.kind).toBe("metres-as-feet");
    expect(preview.depthUnit!.cellsCompared).toBeGreaterThanOrEqual(20);
    // The fixture's depths are the demo's × 0.3048, and a dredge pass deepens them somewhat: about 1/3.28 or a bit more.
    expect(preview.depthUnit!.typicalRatio).toBeGreaterThan(0.25);
    expect(preview.depthUnit!.typicalRatio).toBeLessThan(0.45);
    expect(preview.depthUnit!.message).toMatch(/depths look like metres, not US survey feet as declared/);
    expect(preview.warnings).toContain(preview.depthUnit!.message);
    expect(preview.blockers.join(" ")).toMatch(/another unit than declared/);

    const confirmed = await analyse(site.project.id, metresFile, optionsFor(progress1), { outside: "keep", acceptDepthUnit: true });
    expect(confirmed.preview.depthUnit?.kind).toBe("metres-as-feet");
    expect(confirmed.preview.blockers).toEqual([]);

    const asMetres = await analyse(site.project.id, metresFile, optionsFor(progress1, { lengthUnit: "m" }), { outside: "keep" });
    expect(asMetres.preview.depthUnit).toBeNull();
    expect(asMetres.preview.blockers).toEqual([]);
  });

  it("the API answers 422 with the depth-unit note and stores nothing until acceptDepthUnit=true", async () => {
    const fields = { kind: progress1.kind, surveyedOn: progress1.surveyedOn, waterSurfaceElevation: String(progress1.waterSurfaceElevationFt), timeZone: PROJECT.timeZone, datum: PROJECT.verticalDatum };
    const before = await counts(site.project.id);
    const refused = await postSurvey(site.project.id, site.tokens.surveyor, { path: metresFile }, fields);
    expect(refused.status).toBe(422);
    expect(await counts(site.project.id)).toEqual(before);
    const body = (await refused.json()) as { errors: Array<{ column: string; message: string }> };
    expect(body.errors.find((error) => error.column === "depth")?.message).toMatch(/look like metres.*acceptDepthUnit=true/);
    const accepted = await postSurvey(site.project.id, site.tokens.surveyor, { path: metresFile }, { ...fields, acceptDepthUnit: "true" });
    expect(accepted.status).toBe(201);
  });
});

describe("a field marked as not in the file", () => {
  let site: Awaited<ReturnType<typeof makeDemoSiteProject>>;
  // The first 40 rows of the demo's progress 1 with a "probe" column the crew's software fills
  // with its battery voltage: not a probe depth, and shallower than every depth.
  const lines = readFileSync(join(DEMO_DIR, progress1.fileName), "utf8").trim().split("\n").slice(0, 41);
  const file = {
    name: "with-voltage-column.csv",
    text: `${[`${lines[0]},probe`, ...lines.slice(1).map((line) => `${line},1.2`)].join("\n")}\n`,
  };

  beforeAll(async () => {
    site = await makeDemoSiteProject("not-in-file");
  });

  it("reads a same-named column when nothing is said, and leaves it out when marked", async () => {
    const guessed = await analyse(site.project.id, file, optionsFor(progress1), { outside: "keep" });
    expect(guessed.preview.mapping.probe).toBe("probe");
    expect(guessed.preview.problemRows).toBe(40);
    expect(guessed.preview.problems[0].message).toMatch(/probe depth is shallower than the water depth/);

    const marked = await analyse(site.project.id, file, optionsFor(progress1, { columns: { probe: null } }), { outside: "keep" });
    expect(marked.preview.mapping.probe).toBeNull();
    expect(marked.preview.problemCount).toBe(0);
    expect(marked.preview.blockers).toEqual([]);
    expect(marked.prepared?.probe).toBeNull();
    expect(marked.prepared?.refusalElevation).toBeNull();
  });

  it("the API takes null or an empty header as not in the file", async () => {
    const fields = { kind: progress1.kind, surveyedOn: progress1.surveyedOn, waterSurfaceElevation: String(progress1.waterSurfaceElevationFt), timeZone: PROJECT.timeZone, datum: PROJECT.verticalDatum };
    const refused = await postSurvey(site.project.id, site.tokens.surveyor, { name: file.name, content: file.text }, fields);
    expect(refused.status).toBe(422);
    for (const columns of ['{"probe":null}', '{"probe":""}']) {
      const stored = await postSurvey(site.project.id, site.tokens.surveyor, { name: file.name, content: file.text }, { ...fields, columns, acceptSameFile: "true" });
      expect(stored.status, columns).toBe(201);
    }
    // "Not in the file" is not remembered for the next upload: the next file's probe column is read again.
    const remembered = await ColumnMapping.findOne({ where: { projectId: site.project.id } });
    expect(remembered!.mapping).not.toHaveProperty("probe");
    expect(remembered!.mapping).toMatchObject({ easting: "easting", depth: "depth" });
    const next = await analyse(site.project.id, file, optionsFor(progress1), { outside: "keep" });
    expect(next.preview.mapping.probe).toBe("probe");
  });
});

describe("the staged file read as bytes", () => {
  // The server reads an upload with the parser's byte reader; a file without a header row takes the
  // generated names ("column 1", …) first. The same rows with and without a header must come out the
  // same, with the file's own row numbers (the first data row of a headerless file is row 1).
  let site: Awaited<ReturnType<typeof makeDemoSiteProject>>;
  const lines = readFileSync(join(DEMO_DIR, progress1.fileName), "utf8").trim().split("\n").slice(0, 21);
  const rows = lines.slice(1);
  rows[4] = rows[4].replace(/,[0-9.]+,(?=[^,]*$)/, ",deep,"); // row 5 of the data: a depth that is not a number
  // A headerless export has numbers only in its first row (else that row reads as a header): easting, northing, depth.
  const numbers = rows.map((row) => row.split(",").slice(1, 4).join(","));
  const byName = { easting: "column 1", northing: "column 2", depth: "column 3" };

  beforeAll(async () => {
    site = await makeDemoSiteProject("bytes");
  });

  it("a headerless file with a byte-order mark and CRLF line ends gives the rows of the same file with a header", async () => {
    const withHeader = await analyse(site.project.id, { name: "with-header.csv", text: `${["easting,northing,depth", ...numbers].join("\n")}\n` }, optionsFor(progress1), { outside: "keep" });
    const headerless = await analyse(site.project.id, { name: "headerless.csv", text: `\ufeff${numbers.join("\r\n")}\r\n` }, optionsFor(progress1, { columns: byName }), { outside: "keep" });
    expect(headerless.preview.shape.hasHeader).toBe(false);
    expect(withHeader.preview.problems.map((problem) => [problem.row, problem.column])).toEqual([[6, "depth"]]);
    expect(headerless.preview.problems.map((problem) => [problem.row, problem.column])).toEqual([[5, "column 3"]]);
    const a = withHeader.prepared!;
    const b = headerless.prepared!;
    expect(Array.from(b.sourceRow)).toEqual(Array.from(a.sourceRow, (row) => row - 1));
    expect(Array.from(b.sourceRow).slice(0, 5)).toEqual([1, 2, 3, 4, 6]);
    expect(b.sourceRow.length).toBe(19);
    expect(Array.from(b.easting)).toEqual(Array.from(a.easting));
    expect(Array.from(b.northing)).toEqual(Array.from(a.northing));
    expect(Array.from(b.depth)).toEqual(Array.from(a.depth));
    expect(b.easting[0]).toBe(Number(numbers[0].split(",")[0]));
  });

  it("a quoted cell (the rest of the file read as text) keeps every row and its number", async () => {
    const quoted = [...rows];
    quoted[9] = quoted[9].replace(/^P1-(\d+),/, '"P1-$1, re-shot",');
    const { preview, prepared } = await analyse(site.project.id, { name: "quoted.csv", text: `${[lines[0], ...quoted].join("\n")}\n` }, optionsFor(progress1), { outside: "keep" });
    expect(preview.problems.map((problem) => problem.row)).toEqual([6]);
    expect(prepared!.sourceRow.length).toBe(19);
    expect(prepared!.pointId?.[8]).toMatch(/^P1-\d+, re-shot$/);
    expect(prepared!.sourceRow[8]).toBe(11);
  });
});
