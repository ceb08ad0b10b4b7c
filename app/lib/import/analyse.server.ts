import { createReadStream } from "node:fs";
import { open, stat } from "node:fs/promises";
import { Op } from "sequelize";
import { createCrs } from "../../../shared/crs";
import { guessColumns, type ColumnMappingChoice } from "../../../shared/soundings/column-guess";
import { createSoundingCsvParser, type ParsedSoundings } from "../../../shared/soundings/parse-csv";
import { prepareSoundings, sameCrsCode, type Analysis, type EarlierSurveys, type PrepareOptions } from "../../../shared/soundings/prepare";
import { describeNonText, notTextMessage } from "../../../shared/soundings/file-kind";
import { sniffFileShape, type FileShape } from "../../../shared/soundings/sniff";
import { ColumnMapping, Project, Survey } from "../db.server";
import { resolveCrsDefinition } from "../geo/epsg.server";
import type { CommitChoices, ImportOptions } from "./import-options";
import { previousBottomBins } from "./previous-bottom.server";
import type { ProjectGeometry } from "../engine/project-geometry.server";

/**
 * The import's analysis on the server: reads the staged file (streamed) and what the project
 * already holds (the same file imported before, the earlier surveys' bottom, the declared CRS from
 * the EPSG registry), then hands it all once to the pure prepareSoundings (shared/), which says
 * everything that is wrong with the file and yields the soundings ready to store.
 */
export interface AnalyseInput {
  path: string;
  sha256: string;
  options: ImportOptions;
  choices: CommitChoices;
  geometry: ProjectGeometry;
  /** The name the file was uploaded under, for the messages. */
  fileName?: string;
  /** Now, for the checks against the future (tests set it); the clock by default. */
  now?: number;
  onProgress?: (fraction: number) => void;
}

const HEAD_BYTES = 64 * 1024;

/** The first bytes of a staged file (64 KB at most). */
export async function readFileHeadBytes(path: string, bytes = HEAD_BYTES): Promise<Uint8Array> {
  const handle = await open(path, "r");
  try {
    const buffer = Buffer.alloc(bytes);
    const { bytesRead } = await handle.read(buffer, 0, bytes, 0);
    return buffer.subarray(0, bytesRead);
  } finally {
    await handle.close();
  }
}

function headText(head: Uint8Array): string {
  // Cut at the last line break so a multi-byte character is never split.
  const text = Buffer.from(head).toString("utf8");
  return head.length < HEAD_BYTES ? text : text.slice(0, Math.max(text.lastIndexOf("\n") + 1, 1));
}

/** Why a staged file cannot be a sounding file at all (an image, a workbook, a PDF…), or null when it is text. */
export async function stagedFileNotText(path: string, fileName: string): Promise<string | null> {
  const kind = describeNonText(await readFileHeadBytes(path, 8192));
  return kind ? notTextMessage(fileName, kind) : null;
}

async function sniffStagedFile(path: string, projectId: number) {
  const head = await readFileHeadBytes(path);
  const kind = describeNonText(head);
  const shape = sniffFileShape(kind ? "" : headText(head));
  const remembered = await ColumnMapping.findOne({ where: { projectId } });
  const guess = guessColumns(shape.headers, (remembered?.mapping as ColumnMappingChoice | undefined) ?? null);
  return { shape, guess, kind };
}

async function parseFile(path: string, shape: FileShape, columns: ColumnMappingChoice, onProgress?: (fraction: number) => void): Promise<ParsedSoundings> {
  const size = (await stat(path)).size || 1;
  const parser = createSoundingCsvParser({ columns, delimiter: shape.delimiter, maxErrors: 1_000_000 });
  // The file is read as bytes, the parser's fast way (no string per cell, as the command line reads
  // it). Read as text through Papa Parse, a 1,000,000-row upload took the server to 627 MB while it
  // was parsed, and to 494 MB as bytes; the upload and its parse took 2.7 s instead of 4.6 s
  // (BENCH_TRACE=1 npm run bench -- --only import).
  // A file without a header row gets the generated names ("column 1", …) so the mapping can name them.
  if (!shape.hasHeader) parser.pushBytes(new TextEncoder().encode(`${shape.headers.join(shape.delimiter)}\n`));
  let read = 0;
  let lastReported = 0;
  for await (const chunk of createReadStream(path, { highWaterMark: 1 << 20 })) {
    // A plain view of the chunk: the parser keeps an unfinished line with `slice`, which copies on a
    // Uint8Array (on a Buffer it would be a view of the whole chunk).
    const buffer = chunk as Buffer;
    const bytes = new Uint8Array(buffer.buffer, buffer.byteOffset, buffer.length);
    read += bytes.length;
    parser.pushBytes(bytes);
    if (read - lastReported > size / 50) {
      lastReported = read;
      onProgress?.(Math.min(1, read / size));
    }
  }
  const parsed = parser.end();
  if (!shape.hasHeader) {
    // Row numbers back to the file's own: it has no header, so its first data row is row 1.
    for (let index = 0; index < parsed.sourceRow.length; index++) parsed.sourceRow[index] -= 1;
    for (const error of parsed.errors) error.row = Math.max(1, error.row - 1);
  }
  return parsed;
}

/** The CRS the file was declared in: the project's own when the codes match, else from the EPSG registry. */
function declaredCrsOf(code: string, geometry: ProjectGeometry): PrepareOptions["declaredCrs"] {
  if (sameCrsCode(code, geometry.crsCode)) return geometry.crs;
  try {
    return createCrs(resolveCrsDefinition(code).definition);
  } catch (error) {
    return { problem: (error as Error).message };
  }
}

async function readEarlierSurveys(geometry: ProjectGeometry, sha256: string, soundingCount: number): Promise<EarlierSurveys> {
  const sameFile = await Survey.findAll({
    where: { projectId: geometry.projectId, contentSha256: sha256, id: { [Op.gt]: 0 } },
    order: [["id", "ASC"]],
  });
  // The bins feed the depth-unit check, which a file without soundings never reaches.
  const origin = { x: geometry.settings.originX ?? 0, y: geometry.settings.originY ?? 0 };
  const bins = soundingCount > 0 ? await previousBottomBins(geometry.projectId, geometry.settings.cellSize, origin) : { bottom: new Map<string, number>(), refusal: new Map<string, number>() };
  return {
    sameFile: sameFile.map((survey) => ({ surveyId: survey.id, surveyedOn: survey.surveyedOn, kind: survey.kind, status: survey.status })),
    bottomBins: bins.bottom,
    refusalBins: bins.refusal,
  };
}

export async function analyseStagedFile(input: AnalyseInput): Promise<Analysis> {
  const { options, geometry } = input;
  const { shape, guess, kind } = await sniffStagedFile(input.path, geometry.projectId);
  const mapping: ColumnMappingChoice = { ...guess.mapping, ...(options.columns ?? {}) };
  // A file that is not text is never parsed: its bytes are not rows.
  const parsed = kind ? createSoundingCsvParser().end() : await parseFile(input.path, shape, mapping, input.onProgress);
  const earlier = await readEarlierSurveys(geometry, input.sha256, parsed.sourceRow.length);
  const project = await Project.findByPk(geometry.projectId, { attributes: ["id", "timeZone"] });
  const prepareOptions: PrepareOptions = {
    ...options, choices: input.choices, shape, mapping, lonLatHeaders: guess.lonLat, declaredCrs: declaredCrsOf(options.crs, geometry),
    rememberedFields: guess.remembered.filter((field) => options.columns?.[field] === undefined || options.columns[field] === guess.mapping[field]),
    notText: kind ? notTextMessage(input.fileName ?? "the file", kind) : undefined,
    projectTimeZone: project?.timeZone ?? "UTC",
    now: input.now ?? Date.now(),
  };
  return prepareSoundings(parsed, prepareOptions, geometry, earlier);
}
