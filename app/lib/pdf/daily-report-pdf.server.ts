import { readFileSync } from "node:fs";
import { createRequire } from "node:module";
import PDFDocument from "pdfkit";
import type { CompiledDay } from "../../../shared/daily-report/compile";
import {
  byHandLine, countersignOutdatedLine, earlierCountersignatureLine, enteredHeadCountsLine, equipmentRows, equipmentTotalsLine, findsLine, formatNumber, headCountCell, interruptionLine, lostHoursNote, noComplianceStationLine,
  productionRows, reportUnits, surveyLine, visitorRows, weatherLine,
} from "../../../shared/daily-report/present";
import { localClockOf, localDayOf } from "../../../shared/local-time";
import { unitLabel, type LengthUnit } from "../../../shared/units";

/**
 * The daily report as a PDF (pdfkit), for e-mail and the archive. It writes out the same compiled
 * day the page shows (the figures go through shared/daily-report/present.ts for both), on US
 * Letter, a normal day on one or two pages. Words are set in Helvetica, the PDF standard font every
 * reader carries (pdfkit ships its metrics; nothing is fetched); figures in the Roboto Mono the app
 * ships (@fontsource/roboto-mono), embedded as a subset.
 */

export interface PdfDay {
  date: string;
  report: CompiledDay;
  signed: { name: string; at: string } | null;
  countersigned: { name: string; email: string; at: string } | null;
  amendments: Array<{ text: string; by: string; at: string }>;
  /** Countersignatures before the latest (the report was amended and countersigned again), oldest first. */
  earlierCountersignatures?: Array<{ name: string; email: string; at: string; amendments: number }>;
  /** Amended since the latest countersignature. */
  countersignOutdated?: boolean;
}

export interface PdfProject {
  name: string;
  timeZone: string;
  lengthUnit: LengthUnit;
}

const require = createRequire(import.meta.url);
let monoFont: Buffer | null = null;
function mono(): Buffer {
  monoFont ??= readFileSync(require.resolve("@fontsource/roboto-mono/files/roboto-mono-latin-400-normal.woff"));
  return monoFont;
}

const INK = "#1d2528";
const MUTED = "#5b6870";
const DANGER = "#a3242a";
const LINE = "#d5dcdf";
const MARGIN = 48;

/**
 * Helvetica in a PDF reader covers Windows-1252: anything else a user typed (a letter outside
 * Western Europe, an emoji) is written as "?" rather than as a wrong glyph.
 */
const WIN_ANSI_EXTRA = "€‚ƒ„…†‡ˆ‰Š‹ŒŽ‘’“”•–—˜™š›œžŸ";
function plain(text: string): string {
  return [...text.normalize("NFC")].map((char) => {
    const code = char.codePointAt(0)!;
    return (code >= 0x20 && code <= 0x7e) || (code >= 0xa0 && code <= 0xff) || WIN_ANSI_EXTRA.includes(char) || char === "\n" ? char : "?";
  }).join("");
}

type Part = string | { figure: string } | { danger: string };
interface Piece { font: string; size: number; color: string; text: string; width: number; space: number; x?: number; newline?: boolean }

class ReportWriter {
  readonly doc: PDFKit.PDFDocument;
  private readonly width: number;

  constructor(title: string) {
    this.doc = new PDFDocument({ size: "LETTER", margins: { top: MARGIN, bottom: MARGIN + 14, left: MARGIN, right: MARGIN }, bufferPages: true, info: { Title: title, Creator: "Firmsand" }, lang: "en-US" });
    this.doc.registerFont("mono", mono());
    this.width = this.doc.page.width - 2 * MARGIN;
  }

  private room(height: number) {
    if (this.doc.y + height > this.doc.page.height - this.doc.page.margins.bottom) this.doc.addPage();
  }

  heading(text: string) {
    this.room(40);
    this.doc.moveDown(0.5).font("Helvetica-Bold").fontSize(10.5).fillColor(INK).text(plain(text), MARGIN, this.doc.y, { width: this.width });
    const y = this.doc.y + 1;
    this.doc.moveTo(MARGIN, y).lineTo(MARGIN + this.width, y).lineWidth(0.5).strokeColor(LINE).stroke();
    this.doc.y = y + 3;
  }

  /**
   * Words and figures as one paragraph, wrapped at the text width: figures in the mono, words in
   * Helvetica, every piece set on the line's common baseline (the two fonts' ascents differ by a
   * third of the size, so top-aligned pieces would stagger). A line breaks only at white space,
   * so a figure stays with the word glued to it ("2.33 h" may wrap, "2.33h" never splits).
   */
  line(parts: Part[], options: { size?: number; color?: string } = {}) {
    const size = options.size ?? 9;
    const color = options.color ?? INK;
    // Words: pieces not separated by white space; each piece carries its trailing white space.
    const words: Piece[][] = [];
    let word: Piece[] = [];
    const close = () => {
      if (word.length > 0) words.push(word);
      word = [];
    };
    for (const part of parts) {
      const style = typeof part === "string" ? { font: "Helvetica", size, color, text: plain(part) }
        : "figure" in part ? { font: "mono", size: size - 0.5, color, text: part.figure }
        : { font: "Helvetica", size, color: DANGER, text: plain(part.danger) };
      for (const chunk of style.text.split(/(\n|[^\S\n]+)/)) {
        if (chunk === "") continue;
        if (chunk === "\n") {
          close();
          words.push([{ ...style, text: "", width: 0, space: 0, newline: true }]);
        } else if (/^\s+$/.test(chunk)) {
          const last = word.at(-1) ?? words.at(-1)?.at(-1);
          if (word.length > 0 && last) {
            last.text += " ";
            last.space += this.measure(style.font, style.size, " ");
          }
          close();
        } else {
          word.push({ ...style, text: chunk, width: this.measure(style.font, style.size, chunk), space: 0 });
        }
      }
    }
    close();

    // Lines: as many words as fit the width; a word wider than the line is cut where it must.
    const lines: Piece[][] = [[]];
    let x = 0;
    for (const pieces of words) {
      if (pieces[0]?.newline) {
        lines.push([]);
        x = 0;
        continue;
      }
      const width = pieces.reduce((sum, piece) => sum + piece.width, 0);
      if (x > 0 && x + width > this.width) {
        lines.push([]);
        x = 0;
      }
      for (const piece of pieces) {
        if (x + piece.width > this.width && piece.width > this.width) {
          for (const cut of this.cut(piece, this.width - x)) {
            if (x > 0 && x + cut.width > this.width) {
              lines.push([]);
              x = 0;
            }
            lines.at(-1)!.push({ ...cut, x });
            x += cut.width;
          }
          x += piece.space;
          continue;
        }
        lines.at(-1)!.push({ ...piece, x });
        x += piece.width + piece.space;
      }
    }
    for (const pieces of lines) {
      const metrics = (pieces.length > 0 ? pieces : [{ font: "Helvetica", size }]).map((piece) => this.metrics(piece.font, piece.size));
      const ascent = Math.max(...metrics.map((metric) => metric.ascent));
      const height = ascent + Math.max(...metrics.map((metric) => metric.descent)) + size * 0.22;
      this.room(height);
      const baseline = this.doc.y + ascent;
      for (const piece of pieces) {
        this.doc.font(piece.font).fontSize(piece.size).fillColor(piece.color).text(piece.text, MARGIN + piece.x!, baseline, { lineBreak: false, baseline: "alphabetic" });
      }
      this.doc.x = MARGIN;
      this.doc.y = baseline - ascent + height;
    }
  }

  private measure(font: string, size: number, text: string): number {
    return this.doc.font(font).fontSize(size).widthOfString(text);
  }

  /** The font's ascent and descent at `size`, in points (both positive). */
  private metrics(font: string, size: number): { ascent: number; descent: number } {
    const face = this.doc.font(font).fontSize(size) as unknown as { _font: { ascender: number; descender: number } };
    return { ascent: (face._font.ascender / 1000) * size, descent: (-face._font.descender / 1000) * size };
  }

  /** A word too wide for a whole line, cut into pieces that fit (the first into `room`). */
  private cut(piece: Piece, room: number): Piece[] {
    const pieces: Piece[] = [];
    let rest = piece.text.trimEnd();
    let space = Math.max(room, this.width / 4);
    while (rest.length > 0) {
      let count = rest.length;
      while (count > 1 && this.measure(piece.font, piece.size, rest.slice(0, count)) > space) count -= 1;
      const text = rest.slice(0, count);
      pieces.push({ ...piece, text, width: this.measure(piece.font, piece.size, text), space: 0 });
      rest = rest.slice(count);
      space = this.width;
    }
    return pieces;
  }

  note(text: string) {
    this.line([text], { size: 7.5, color: MUTED });
  }

  /**
   * A table of words and figures; `figures` marks the columns set in the mono, `danger` the cells
   * set in red. Cells of a row share one baseline whatever their font.
   */
  table(headers: string[] | null, rows: string[][], widths: number[], figures: boolean[], danger: (row: number, column: number) => boolean = () => false) {
    const total = widths.reduce((a, b) => a + b, 0);
    const columns = widths.map((width) => (width / total) * this.width);
    const drawRow = (cells: string[], header: boolean, rowIndex: number) => {
      const styles = cells.map((cell, index) => {
        const font = header ? "Helvetica-Bold" : figures[index] ? "mono" : "Helvetica";
        const size = header ? 8 : figures[index] ? 8 : 8.5;
        const text = header || !figures[index] ? plain(cell) : cell;
        this.doc.font(font).fontSize(size);
        return { font, size, text, height: this.doc.heightOfString(text, { width: columns[index]! - 6 }), ...this.metrics(font, size) };
      });
      const ascent = Math.max(...styles.map((style) => style.ascent));
      const height = Math.max(...styles.map((style) => ascent - style.ascent + style.height)) + 5;
      this.room(height + 2);
      const top = this.doc.y;
      let x = MARGIN;
      styles.forEach((style, index) => {
        const color = header ? MUTED : danger(rowIndex, index) ? DANGER : INK;
        this.doc.font(style.font).fontSize(style.size).fillColor(color).text(style.text, x, top + 2.5 + ascent, { width: columns[index]! - 6, baseline: "alphabetic" });
        x += columns[index]!;
      });
      this.doc.moveTo(MARGIN, top + height).lineTo(MARGIN + this.width, top + height).lineWidth(0.3).strokeColor(LINE).stroke();
      this.doc.x = MARGIN;
      this.doc.y = top + height + 1;
    };
    if (headers) drawRow(headers, true, -1);
    rows.forEach((row, index) => drawRow(row, false, index));
  }

  /** Keeps the next `height` points together on one page (a heading with what follows it). */
  keep(height: number) {
    this.room(height);
  }

  /** A signature line: what was signed, or a blank line to sign by hand. */
  signature(label: string, signed: { name: string; detail: string } | null) {
    this.room(44);
    this.doc.moveDown(0.6);
    const top = this.doc.y;
    if (signed) {
      this.doc.font("Helvetica-Oblique").fontSize(12).fillColor(INK).text(plain(signed.name), MARGIN, top, { width: this.width / 2 });
    }
    const y = top + 16;
    this.doc.moveTo(MARGIN, y).lineTo(MARGIN + this.width * 0.55, y).lineWidth(0.7).strokeColor(INK).stroke();
    this.doc.font("Helvetica").fontSize(8).fillColor(MUTED).text(plain(`${label}${signed ? ` — ${signed.detail}` : " — not signed"}`), MARGIN, y + 3, { width: this.width });
    this.doc.y = y + 16;
  }

  footer(left: string) {
    const range = this.doc.bufferedPageRange();
    for (let index = range.start; index < range.start + range.count; index += 1) {
      this.doc.switchToPage(index);
      const bottom = this.doc.page.height - MARGIN + 2;
      const saved = this.doc.page.margins.bottom;
      this.doc.page.margins.bottom = 0;
      this.doc.font("Helvetica").fontSize(7.5).fillColor(MUTED).text(plain(left), MARGIN, bottom, { width: this.width * 0.8, lineBreak: false });
      this.doc.font("Helvetica").fontSize(7.5).fillColor(MUTED).text(`Page ${index - range.start + 1} of ${range.count}`, MARGIN, bottom, { width: this.width, align: "right", lineBreak: false });
      this.doc.page.margins.bottom = saved;
    }
  }

  async bytes(): Promise<Buffer> {
    const chunks: Buffer[] = [];
    this.doc.on("data", (chunk: Buffer) => chunks.push(chunk));
    const done = new Promise<void>((resolve, reject) => {
      this.doc.on("end", () => resolve());
      this.doc.on("error", reject);
    });
    this.doc.end();
    await done;
    return Buffer.concat(chunks);
  }
}

function writeDay(writer: ReportWriter, project: PdfProject, day: PdfDay) {
  const { report, signed, countersigned, amendments } = day;
  const units = reportUnits(project.lengthUnit);
  const length = unitLabel(project.lengthUnit);
  const clock = (iso: string) => localClockOf(Date.parse(iso), project.timeZone);
  const stamp = (iso: string) => `${localDayOf(Date.parse(iso), project.timeZone)} ${clock(iso)}`;
  const doc = writer.doc;

  doc.font("Helvetica").fontSize(8).fillColor(MUTED).text(plain(`Firmsand · ${project.name}`), MARGIN, doc.y);
  writer.line(["Daily report · ", { figure: day.date }], { size: 15 });
  writer.note(`Local day in ${project.timeZone}. ${signed ? `Figures as signed by ${signed.name} at ${stamp(signed.at)}.` : "Draft: figures compiled from the records as they stand now; not signed."}`);

  if (report.missing.length > 0) {
    writer.heading("Missing");
    for (const item of report.missing) writer.line([{ danger: `• ${item}` }]);
  }

  writer.heading("Weather and notes");
  const weather = weatherLine(report.entered.weather);
  writer.line([weather ?? "No weather entered.", ...(report.entered.weather?.effect ? [` — effect on the work: ${report.entered.weather.effect}`] : [])]);
  // Safety is written even when empty: "none entered" is not a blank a reader must guess at.
  writer.line([`Safety (toolbox talk, incidents): ${report.entered.safety || "none entered."}`], report.entered.safety ? {} : { color: MUTED });
  if (report.entered.notes) writer.line([`Notes: ${report.entered.notes}`]);
  writer.note("Incidents are reported as the project's safety plan directs; this report records them, it does not replace that reporting.");

  // Equipment working and idle, with the reason for each idle spell: written even when empty.
  writer.heading("Equipment");
  const equipment = report.entered.equipment ?? [];
  if (equipment.length === 0) writer.line(["None entered."], { color: MUTED });
  else {
    writer.table(["Equipment", "Working (h)", "Idle (h)", "Idle reason"], equipmentRows(equipment), [3, 1.3, 1.2, 5.5], [false, true, true, false]);
    writer.line([equipmentTotalsLine(equipment)!], { size: 8, color: MUTED });
  }

  // Inspections and visitors with their local times, written even when empty; a report begun before
  // visitors had lines keeps its free-text note.
  writer.heading("Inspections and visitors");
  const visitors = visitorRows(report.entered.visitors);
  if (visitors.length === 0) writer.line(["None entered."], { color: MUTED });
  else writer.table(["Arrived", "Left", "Name", "Organisation", "Purpose or notes"], visitors, [1.1, 1.1, 2.6, 2.6, 4.6], [true, true, false, false, false]);
  if (report.entered.inspections) writer.line([`Earlier note (entered as text): ${report.entered.inspections}`]);

  writer.heading("Dive work");
  writer.line([{ figure: String(report.dives.count) }, " dives · ", { figure: String(report.dives.bottomMinutes) }, " bottom minutes · deepest ", { figure: report.dives.maxDepth === null ? "—" : `${report.dives.maxDepth} ${length}` }]);
  if (report.teams.length > 0) {
    writer.table(
      ["Team", "Head count", "Dives", "Bottom time (min)", `Max depth (${length})`, "Cells"],
      report.teams.map((team) => [team.team, headCountCell(team), String(team.dives), String(team.bottomMinutes), team.maxDepth === null ? "—" : String(team.maxDepth), team.cells.join(" ")]),
      [3, 1.5, 1.2, 2, 2, 4],
      [false, true, true, true, true, true],
    );
  }
  const headCounts = enteredHeadCountsLine(report.teams);
  if (headCounts) writer.line([headCounts]);
  const visitingDivers = report.teams.filter((team) => (team.visitors ?? []).length > 0);
  if (visitingDivers.length > 0) writer.line([`Visitors diving (not on the team's roster): ${visitingDivers.map((team) => `${team.team}: ${team.visitors!.join(", ")}`).join("; ")}.`]);
  for (const flag of report.dives.flags) writer.line([{ danger: `• ${flag}` }]);
  if (report.dives.flags.length > 0) writer.note("Flags are information from the published table, never approval; the dive safety plan governs.");

  writer.heading("Production");
  const rows = productionRows(report.production, units);
  writer.table(null, [0, 2, 4, 6].map((index) => [rows[index]![0], rows[index]![1], rows[index + 1]![0], rows[index + 1]![1]]), [3, 2.5, 3, 2.5], [false, true, false, true]);
  if (report.production.haulTickets.length > 0) writer.line(["Tickets: ", { figure: report.production.haulTickets.join(", ") }], { size: 8 });
  const survey = surveyLine(report.production.survey);
  if (survey) writer.line([survey]);

  writer.heading("Water quality");
  const quality = report.waterQuality;
  if (quality.complianceStations?.length === 0) writer.line([noComplianceStationLine()]);
  if (quality.readings.length === 0) writer.line([quality.complianceStations?.length === 0 ? "No readings." : "No stations and no readings."], { color: MUTED });
  else {
    writer.table(
      ["Station", "Kind", "Readings", "Highest", "Verdict"],
      quality.readings.map((row) => [row.station, row.stationKind, String(row.count), row.count > 0 ? `${row.maxValue} ${row.unit}` : "—", row.count > 0 ? row.verdict : "no readings"]),
      [4, 1.6, 1.2, 1.6, 1.6],
      [false, false, true, true, false],
      (index, column) => column === 4 && (quality.readings[index]!.verdict === "exceeds" || (quality.readings[index]!.count === 0 && quality.readings[index]!.stationKind === "compliance")),
    );
  }
  for (const row of quality.exceedances) writer.line([{ danger: `Exceedance at ${row.station}, ` }, { figure: clock(row.at) }, { danger: ": " }, { figure: String(row.value) }, ` ${row.unit}`]);
  for (const gap of quality.missedIntervals) writer.line([{ danger: "No compliance reading " }, { figure: `${clock(gap.from)}–${clock(gap.to)}` }]);
  writer.note("Readings support the permit's monitoring; the permit and the agency decide compliance.");

  writer.heading("Interruptions");
  if (report.interruptions.length === 0) writer.line(["None recorded."], { color: MUTED });
  for (const event of report.interruptions) writer.line([interruptionLine(event, project.timeZone)]);
  const overlapped = lostHoursNote(report);
  writer.line(["Lost in all: ", { figure: formatNumber(report.lostHours, 2) }, " h", ...(overlapped ? [` (${overlapped})`] : [])]);

  writer.heading("Finds");
  writer.line([findsLine(report.finds.byCategory) ?? "No finds."]);
  const byHand = byHandLine(report.finds.byHand, project.lengthUnit);
  if (byHand) writer.line([byHand]);
  if (report.finds.catalogueNumbers.length > 0) writer.line([{ figure: report.finds.catalogueNumbers.join(", ") }], { size: 8 });
  if (report.holds.placed.length > 0) writer.line(["Holds placed: ", { figure: report.holds.placed.join(", ") }]);
  if (report.holds.lifted.length > 0) writer.line(["Holds lifted: ", { figure: report.holds.lifted.join(", ") }]);
  writer.note("No find locations appear in this report.");

  // The sign-off block stays on one page: a signature never sits apart from its heading.
  writer.keep(140);
  writer.heading("Sign-off");
  writer.signature("Dive supervisor or manager (typed name as signature)", signed ? { name: signed.name, detail: `signed ${stamp(signed.at)}` } : null);
  writer.signature("Agency inspector (countersignature)", countersigned ? { name: countersigned.name, detail: `countersigned ${stamp(countersigned.at)} through the link sent to ${countersigned.email}` } : null);
  if (day.countersignOutdated) writer.note(countersignOutdatedLine());
  for (const earlier of day.earlierCountersignatures ?? []) writer.note(earlierCountersignatureLine(earlier, stamp));
  if (amendments.length > 0) {
    writer.heading("Amendments");
    for (const amendment of amendments) writer.line([{ figure: stamp(amendment.at) }, ` by ${amendment.by}: ${amendment.text}`]);
  }
}

/** One day's report as PDF bytes. */
export async function renderDailyReportPdf(project: PdfProject, day: PdfDay): Promise<Buffer> {
  const writer = new ReportWriter(`Daily report ${day.date} · ${project.name}`);
  writeDay(writer, project, day);
  writer.footer(`${project.name} · daily report ${day.date} · ${day.signed ? "as signed" : "draft"}`);
  return writer.bytes();
}

/** Several days in one PDF (a two-week batch), each day starting on a new page. */
export async function renderDailyReportBatchPdf(project: PdfProject, days: readonly PdfDay[]): Promise<Buffer> {
  const first = days[0]?.date ?? "";
  const last = days.at(-1)?.date ?? "";
  const writer = new ReportWriter(`Daily reports ${first} to ${last} · ${project.name}`);
  days.forEach((day, index) => {
    if (index > 0) writer.doc.addPage();
    writeDay(writer, project, day);
  });
  writer.footer(`${project.name} · daily reports ${first} to ${last}`);
  return writer.bytes();
}
