import { describe, expect, it } from "vitest";
import { compileDay, type DayRecords } from "../../../shared/daily-report/compile";
import { instantOfLocal } from "../../../shared/local-time";
import { pdfPages, pdfTextItems, type PdfTextItem } from "../../../tests/pdf-text";
import { renderDailyReportPdf, type PdfDay } from "./daily-report-pdf.server";

// The PDF's layout as a reader sees it, read back with PDF.js (what browsers use): on a full day
// (long team name, a dozen cells, notes over several lines, three stations, a flag, interruptions with
// weather downtime, head counts entered, inspections and visitors, finds, both signatures and an amendment) no text overlaps other text or runs past the margin,
// words and figures of one line share its baseline (Helvetica and the Roboto Mono have different
// ascents: set top-aligned, the figures sat a third of a line low and the next words wrapped), and the
// sign-off stays with its heading. practice: a printed report is read and signed on paper.

const TZ = "America/New_York";
const DAY = "2026-06-10";
const at = (hh: number, mm = 0) => instantOfLocal(DAY, hh * 60 + mm, TZ);
const MARGIN = 48;

function fullDay(overrides: Partial<DayRecords> = {}): PdfDay {
  const report = compileDay({
    date: DAY, timeZone: TZ, nowMs: at(20), lengthLabel: "ftUS",
    dives: [
      { team: "Alpha", diver: "Rosa Quintero", bottomMinutes: 42, maxDepth: 11.5, cells: ["B3", "B4", "B5", "B6", "C3", "C4"], beyondNoDecompression: false },
      { team: "Alpha", diver: "Tomasz Wielicki-Brandt", bottomMinutes: 95, maxDepth: 38, cells: ["B4"], beyondNoDecompression: true },
      { team: "Bravo Long Team Name For Night Shift", diver: "Eli Marsh", bottomMinutes: 55, maxDepth: 9, cells: ["D7", "D8", "D9", "D10", "D11", "D12", "E7", "E8", "E9", "E10", "E11", "E12"], beyondNoDecompression: false },
      { team: "Charlie", diver: "Guest Diver", visitor: true, bottomMinutes: 20, maxDepth: 6, cells: ["F1"], beyondNoDecompression: false },
    ],
    plannedTeams: [{ team: "Alpha", headCount: 5 }, { team: "Bravo Long Team Name For Night Shift", headCount: 4 }],
    shifts: [{ pumpHours: 5, slurryFlow: { value: 450, unit: "gpm" }, drySolidsKg: 7000, neatPolymerKg: 6.5 }],
    tubeFills: 3,
    hauls: [{ ticketNumber: "H-101", drySolidsKg: 9100, loadWetMass: null, loadVolume: null }, { ticketNumber: "H-102", drySolidsKg: 8750.5, loadWetMass: null, loadVolume: null }],
    complianceStations: ["C1", "C2 downstream of the silt curtain"],
    readings: [
      { station: "C1", stationKind: "compliance", takenAtMs: at(8), value: 12.4, unit: "NTU", exceeds: false },
      { station: "C1", stationKind: "compliance", takenAtMs: at(14), value: 61.2, unit: "NTU", exceeds: true },
      { station: "B1 background", stationKind: "background", takenAtMs: at(8), value: 5.1, unit: "NTU", exceeds: null },
    ],
    sampling: { intervalMinutes: 240, workdayStartMinutes: 420, workdayEndMinutes: 1140 },
    interruptions: [
      { kind: "stop-work", reason: "turbidity at C1", startMs: at(14, 5), endMs: at(15, 40) },
      { kind: "stand-down", reason: "West Indian manatee", startMs: at(10), endMs: at(10, 45) },
    ],
    finds: [{ catalogueNumber: "F-2026-0012", category: "cultural" }, { catalogueNumber: "F-2026-0013", category: "faunal" }],
    holds: [{ catalogueNumber: "F-2026-0012", placedAtMs: at(11), liftedAtMs: null }],
    entered: {
      weather: { conditions: "Overcast, light chop", airTemperature: "18 °C", wind: "SW 10 kn gusting 18", rain: "showers after 15:00", effect: "Afternoon showers slowed the haul trucks on the access road; no effect on diving until the turbidity stop." },
      equipment: [
        { name: "Suction pump 1 (8 in, diver-held intake)", workingHours: 7.5, idleHours: 2.5, idleReason: "waiting on the turbidity stop at C1, then the manatee stand-down; restarted once C1 read within the limit again" },
        { name: "Booster pump", workingHours: 7.5, idleHours: 0, idleReason: "" },
        { name: "Work boat", workingHours: 0, idleHours: 10, idleReason: "outboard under repair" },
      ],
      crews: [{ team: "Alpha", headCount: 6, reason: "two tenders and the dive supervisor on the barge" }, { team: "Charlie", headCount: 3, reason: "" }],
      weatherDowntime: [{ start: "15:00", end: "16:15", reason: "lightning within 10 miles" }, { start: "07:00", end: "07:40", reason: "fog on the open water" }],
      visitors: [
        { arrived: "09:30", left: "11:05", name: "Morgan Alvarez", organisation: "District water agency", purpose: "silt curtain and dewatering pad inspection; no findings" },
        { arrived: "10:15", left: "10:50", name: "Priya Natarajan", organisation: "Lake Mirren Friends (funder)", purpose: "site visit with photos for the newsletter" },
        { arrived: "13:40", left: "", name: "Sam Okafor", organisation: "County roads", purpose: "access road condition after the showers" },
      ],
      inspections: "09:30 agency inspector walked the silt curtain and the dewatering pad.",
      safety: "Toolbox talk: hose entanglement and line signals. No incidents.",
      notes: "Cell B4 still soft at the east edge; plan another pass tomorrow. ".repeat(4) + "contact:someone.with.a.very.long.address.that.cannot.break@agency-example-of-some-length.example.org",
    },
    survey: null,
    ...overrides,
  });
  return {
    date: DAY, report,
    signed: { name: "Dana Reyes", at: new Date(at(18, 30)).toISOString() },
    countersigned: { name: "Morgan Alvarez", email: "morgan.alvarez@agency.example", at: new Date(at(19, 5)).toISOString() },
    amendments: [{ text: "Air temperature read at 07:00, not noon.", by: "Dana Reyes", at: new Date(at(19, 30)).toISOString() }],
    earlierCountersignatures: [{ name: "Sam Okafor", email: "sam.okafor@agency.example", at: new Date(at(18, 50)).toISOString(), amendments: 0 }],
  };
}

const PROJECT = { name: "Lake Mirren muck removal, phase 2", timeZone: TZ, lengthUnit: "us-ft" as const };

/** The runs of text on the same baseline as the first run that starts with `text`. */
function lineOf(items: PdfTextItem[], text: string): PdfTextItem[] {
  const first = items.find((item) => item.text.startsWith(text));
  expect(first, `a run starting "${text}"`).toBeDefined();
  return items.filter((item) => item.page === first!.page && Math.abs(item.y - first!.y) < 0.05);
}
/** A line's runs left to right; a gap wider than a fifth of the size reads as a space (as a reader's copy would). */
function joined(items: PdfTextItem[]): string {
  const sorted = [...items].sort((a, b) => a.x - b.x);
  return sorted.map((item, index) => {
    const before = sorted[index - 1];
    return (before && item.x - (before.x + before.width) > 0.2 * item.size ? " " : "") + item.text;
  }).join("").replace(/\s+/g, " ").trim();
}

describe("the daily report PDF's layout", () => {
  it("sets words and figures of a line on one baseline, on one line", async () => {
    const { items } = await pdfTextItems(await renderDailyReportPdf(PROJECT, fullDay()));
    expect(joined(lineOf(items, "Daily report"))).toBe(`Daily report · ${DAY}`);
    // computed: 42 + 95 + 55 + 20 = 212 minutes; deepest 38
    expect(joined(lineOf(items, "dives"))).toBe("4 dives · 212 bottom minutes · deepest 38 ftUS");
    // computed: stand-down 10:00–10:45, stop-work 14:05–15:40, weather 07:00–07:40 and 15:00–16:15 (over the stop-work's last 40 min):
    // covered 0:40 + 0:45 + 14:05–16:15 (2:10) = 3.58 h; line by line 0.67 + 0.75 + 1.58 + 1.25 = 4.25 h.
    expect(joined(lineOf(items, "Lost in all"))).toBe("Lost in all: 3.58 h (interruptions overlapped: an hour lost to two causes counts once; 4.25 h line by line)");
    expect(joined(lineOf(items, "Weather downtime (lightning"))).toBe("Weather downtime (lightning within 10 miles) from 15:00 to 16:15: 1.25 h lost on the day");
    expect(joined(lineOf(items, "Exceedance"))).toBe("Exceedance at C1, 14:00: 61.2 NTU");
    // A table row's words and figures share its first line's baseline.
    expect(joined(lineOf(items, "Alpha"))).toBe("Alpha 6 entered 2 137 38 B3 B4 B5 B6 C3 C4");
    // The compiled figure beside the entered one (the line wraps after its first line).
    expect(joined(lineOf(items, "Head counts entered"))).toMatch(/^Head counts entered: Alpha 5 from the day plan, entered 6 \(two tenders and the dive supervisor on the barge\); Charlie 1 from the/);
    expect(joined(lineOf(items, "dive log, entered 3"))).toBe("dive log, entered 3.");
    // The visitors are a table: arrived, left, name, organisation, purpose.
    // (A long organisation wraps in its cell: the row's first line holds the rest of the row.)
    expect(joined(lineOf(items, "Priya Natarajan"))).toBe("10:15 10:50 Priya Natarajan Lake Mirren Friends site visit with photos for the newsletter");
    expect(joined(lineOf(items, "(funder)"))).toBe("(funder)");
    expect(joined(lineOf(items, "Sam Okafor"))).toBe("13:40 — Sam Okafor County roads access road condition after the showers");
    expect(joined(lineOf(items, "Slurry pumped"))).toMatch(/^Slurry pumped 134,992 gal Dry solids pumped 7\.72 short tons$/);
    // The equipment is a table: name, hours working, hours idle, idle reason (a long reason wraps in its cell).
    expect(joined(lineOf(items, "Booster pump"))).toBe("Booster pump 7.5 0 —");
    expect(joined(lineOf(items, "Work boat"))).toBe("Work boat 0 10 outboard under repair");
    expect(joined(lineOf(items, "3 pieces"))).toBe("3 pieces: 15 h working, 12.5 h idle");
    // The water-quality readings are a table: station, kind, readings, highest, verdict.
    expect(joined(lineOf(items, "C2 downstream"))).toBe("C2 downstream of the silt curtain compliance 0 — no readings");
  });

  it("keeps every run inside the margins and never over another run, on at most two pages", async () => {
    const bytes = await renderDailyReportPdf(PROJECT, fullDay());
    const { pages, items } = await pdfTextItems(bytes);
    expect(pages.length).toBeLessThanOrEqual(2);
    for (const item of items) {
      const page = pages[item.page - 1]!;
      expect(item.x, item.text).toBeGreaterThanOrEqual(MARGIN - 0.5);
      expect(item.x + item.width, item.text).toBeLessThanOrEqual(page.width - MARGIN + 0.5);
      expect(item.y, item.text).toBeGreaterThan(MARGIN - 20);
    }
    // Two runs overlap when their boxes (baseline − 0.25 size to baseline + 0.75 size) cross by more than half a point each way.
    const box = (item: PdfTextItem) => ({ left: item.x, right: item.x + item.width, bottom: item.y - 0.25 * item.size, top: item.y + 0.75 * item.size });
    const overlaps: string[] = [];
    items.forEach((a, index) => {
      for (const b of items.slice(index + 1)) {
        if (a.page !== b.page) continue;
        const p = box(a);
        const q = box(b);
        if (Math.min(p.right, q.right) - Math.max(p.left, q.left) > 0.5 && Math.min(p.top, q.top) - Math.max(p.bottom, q.bottom) > 0.5) overlaps.push(`"${a.text}" / "${b.text}"`);
      }
    });
    expect(overlaps).toEqual([]);
    // A word longer than the line is cut to fit, not run off the page; nothing of it is lost.
    expect((await pdfPages(bytes)).join(" ").replace(/\s+/g, "")).toContain("contact:someone.with.a.very.long.address.that.cannot.break@agency-example-of-some-length.example.org");
  });

  it("keeps the sign-off with its heading and says the entered fields even when empty", async () => {
    const bytes = await renderDailyReportPdf(PROJECT, { ...fullDay({ entered: { weather: null, inspections: "", safety: "", notes: "" } }), signed: null, countersigned: null, amendments: [] });
    const { items } = await pdfTextItems(bytes);
    const heading = items.find((item) => item.text === "Sign-off")!;
    expect(items.find((item) => item.text === "Equipment")).toBeDefined();
    const lines = items.filter((item) => item.text.includes("— not signed"));
    expect(lines).toHaveLength(2);
    for (const line of lines) expect(line.page).toBe(heading.page);
    const text = (await pdfPages(bytes)).join(" ");
    expect(text).toContain("Inspections and visitors None entered.");
    expect(text).toContain("Safety (toolbox talk, incidents): none entered.");
    expect(text).toContain("Equipment None entered.");
  });

  it("on a project with no compliance station says so and lists no sampling gap", async () => {
    const day = fullDay({ complianceStations: [], readings: [{ station: "B1 background", stationKind: "background", takenAtMs: at(8), value: 5.1, unit: "NTU", exceeds: null }] });
    const text = (await pdfPages(await renderDailyReportPdf(PROJECT, day))).join(" ");
    expect(text).toContain("No compliance station is set up for this project, so missed sampling intervals are not checked. A manager adds one under Water quality › Setup › Monitoring stations.");
    expect(text).not.toMatch(/No compliance reading|not sampled \d/);
  });
});
