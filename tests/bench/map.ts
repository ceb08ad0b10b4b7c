/**
 * Coverage map benchmark: in headless Chromium, the time from navigation to the cells drawn on the
 * map of a synthetic 100,000-cell bay, and the bytes sent for it over the network (compressed, as
 * on the wire). Goal on this machine kind: under 3 s and under 2 MB.
 *
 * It needs the app running on a migrated database (the DB_* environment, as for the app) and
 * seeds what it measures into that database through the app's models and the real sounding
 * import (a manager, the bay project with its work limit and two zones, a baseline and a
 * progress survey). `npm run bench` does all of it; by hand:
 *   BENCH_BASE_URL=http://127.0.0.1:3210 CHROMIUM_PATH=/usr/bin/chromium \
 *   DB_PORT=3308 DB_NAME=firmsand_bench DB_PASSWORD=… npx tsx tests/bench/map.ts [--runs N] [--soundings N] [--keep] [--reuse]
 * With --demo it measures the seeded demo project instead (a few hundred cells, with its zones,
 * stations, tubes and sightings drawn too), signed in as the demo's manager: goal under 1 s. It then
 * seeds nothing and needs a database the demo was seeded into (`npm run bench -- --only map-demo`).
 * Each of --runs (3) runs makes a cold load in a fresh browser context, then a warm one on the same
 * page; the figures are the median run's, and the load average is printed beside each run (the
 * machine may be shared, and software WebGL makes the drawing CPU-bound).
 * --profile DIR writes the page's main thread during each cold and each warm load as a .cpuprofile; --trace DIR a
 * Chromium trace of each cold load (every thread: the page, the map's worker, the GPU process); --waterfall
 * prints every request of the loads with when it was asked for, began and ended.
 * What it seeds (under names of its own run) is removed at the end unless --keep is given; --reuse
 * measures a bay kept that way instead of seeding one.
 *
 * "Drawn" is the map element's data-cells-drawn attribute (set in MapLibre's first complete frame,
 * or once it is idle after the cells' setData), and the bench checks that the cells layer really has
 * rendered features then. The figure is when that frame is on screen: the first task after it, which
 * runs once the frame has been committed to the compositor (in software GL, once the map's canvas
 * has been read back, waiting for every draw still queued). Times are read in the page
 * (performance.now(), whose origin is the start of the navigation).
 * Bytes are Chromium's own count (DevTools protocol, Network.loadingFinished encodedDataLength:
 * headers plus the body as received) for every request of a cold load in a fresh browser context.
 */
import { closeSync, createReadStream, mkdirSync, mkdtempSync, openSync, rmSync, statSync, writeFileSync, writeSync } from "node:fs";
import { availableParallelism, loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import { Readable } from "node:stream";
import { Op } from "sequelize";
import { chromium, type Browser, type BrowserContext, type CDPSession, type Page } from "@playwright/test";
import { createCrs } from "../../shared/crs";
import type { SurveyPoints } from "../../shared/pipeline";
import { resolveCrsDefinition } from "../../app/lib/geo/epsg.server";
import { Membership, Project, Survey, User, Zone } from "../../app/lib/db.server";
import { hashPassword } from "../../app/lib/auth/password.server";
import { importSurveyFile } from "../../app/lib/import/import-service.server";
import { writeStagedFile } from "../../app/lib/import/stage-upload.server";
import { closeSequelize } from "../../db/connection.server";
import { ellipseLimit, syntheticSurveys, type Basin } from "./synthetic";
import { PROJECT as DEMO_PROJECT } from "../../sample-data/scenario";

const demo = process.argv.includes("--demo");
// The issue "engine speed": the 100,000-cell bay under 3 s, the demo (a few hundred cells) under 1 s.
const GOAL_SECONDS = demo ? 1 : 3;
const GOAL_BYTES = 2_000_000;
const FEWEST_CELLS = demo ? 100 : 100_000;
const DEMO_MANAGER = { email: "manager@example.org", password: "firmsand-demo" };

const argument = (name: string) => {
  const at = process.argv.indexOf(name);
  return at > 0 ? process.argv[at + 1] : undefined;
};
const soundings = Number(argument("--soundings") ?? 150_000);
const keep = process.argv.includes("--keep");
const profileDir = argument("--profile");
const traceDir = argument("--trace");
const reuse = process.argv.includes("--reuse");
const runs = Math.max(1, Number(argument("--runs") ?? 3));
const baseUrl = process.env.BENCH_BASE_URL;
if (!baseUrl) throw new Error("BENCH_BASE_URL is not set (the running app, e.g. http://127.0.0.1:3210)");
const base = new URL(baseUrl);
if (base.hostname !== "127.0.0.1") throw new Error(`BENCH_BASE_URL must be on 127.0.0.1, not ${base.hostname}`);
const chromiumPath = process.env.CHROMIUM_PATH ?? "/usr/bin/chromium";

// The bay of tests/bench/cells-payload.ts: 5 m cells over an ellipse of 1,020 m × 788 m in
// EPSG:32617 hold just over 100,000 cells (invented site).
const bay: Basin = { name: "100,000-cell bay", centreX: 420_000, centreY: 3_150_000, radiusX: 1020, radiusY: 788, waterDepth: 3, muckThickness: 1 };
const CRS = "EPSG:32617";
// Names of this run's own, so two runs on one database never touch each other's data.
const RUN = `${Date.now().toString(36)}-${process.pid}`;
const SLUG_PREFIX = "bench-map-bay-";
const EMAIL_PREFIX = "bench-map-manager-";
const PASSWORD = "bench-map-password-not-secret";

const crs = createCrs(resolveCrsDefinition(CRS).definition);
const lonLatRing = (ring: Array<[number, number]>) => ring.map(([x, y]) => crs.toLonLat(x, y));

/** Soundings as the CSV a surveyor uploads: depths below a water surface at elevation 0. */
function writeSurveyCsv(path: string, points: SurveyPoints, firm: SurveyPoints | null) {
  const descriptor = openSync(path, "w");
  let parts: string[] = [firm ? "point_id,easting,northing,depth,probe" : "point_id,easting,northing,depth"];
  for (let index = 0; index < points.easting.length; index++) {
    const head = `P${index + 1},${points.easting[index].toFixed(2)},${points.northing[index].toFixed(2)},${(-points.elevation[index]).toFixed(2)}`;
    parts.push(firm ? `${head},${(-firm.elevation[index]).toFixed(2)}` : head);
    if (parts.length >= 10_000) {
      writeSync(descriptor, `${parts.join("\n")}\n`);
      parts = [];
    }
  }
  if (parts.length > 0) writeSync(descriptor, `${parts.join("\n")}\n`);
  closeSync(descriptor);
}

async function seed(): Promise<{ projectId: number; userId: number; email: string; seconds: number; reused: boolean }> {
  const started = performance.now();
  if (demo) {
    const project = await Project.findOne({ where: { name: DEMO_PROJECT.name } });
    const user = await User.findOne({ where: { email: DEMO_MANAGER.email } });
    if (!project || !user) throw new Error(`--demo: the demo project "${DEMO_PROJECT.name}" or ${DEMO_MANAGER.email} is not in this database (seed it: tsx db/seed.ts demo)`);
    return { projectId: project.id, userId: user.id, email: user.email, seconds: (performance.now() - started) / 1000, reused: true };
  }
  if (reuse) {
    // A bay kept by an earlier --keep run, with both its surveys in.
    for (const project of await Project.findAll({ where: { slug: { [Op.startsWith]: SLUG_PREFIX } }, order: [["id", "DESC"]] })) {
      const membership = await Membership.findOne({ where: { projectId: project.id, role: "manager" } });
      const user = membership ? await User.findByPk(membership.userId) : null;
      if (user?.email.startsWith(EMAIL_PREFIX) && (await Survey.count({ where: { projectId: project.id } })) === 2) {
        return { projectId: project.id, userId: user.id, email: user.email, seconds: (performance.now() - started) / 1000, reused: true };
      }
    }
  }
  const email = `${EMAIL_PREFIX}${RUN}@example.org`;
  const user = await User.create({ email, name: "Map benchmark manager", passwordHash: await hashPassword(PASSWORD), isSiteAdmin: false });
  const limit = ellipseLimit(bay)[0][0];
  const project = await Project.create({
    name: "Map benchmark bay (synthetic)",
    slug: `${SLUG_PREFIX}${RUN}`,
    crs: CRS,
    lengthUnit: "m",
    gridOriginE: bay.centreX - 2000,
    gridOriginN: bay.centreY - 2000,
    cellSize: 5,
    rasterResolution: 1,
    maxEdge: 15,
    tolerance: 0.08,
    firmShare: 0.95,
    minCoverage: 0.8,
    workLimitGeoJson: JSON.stringify({ type: "Polygon", coordinates: [lonLatRing(limit)] }),
  });
  await Membership.create({ userId: user.id, projectId: project.id, role: "manager" });
  // Two zones: the bay's north and south halves (a little past the limit, as drawn by hand).
  const half = (north: boolean): Array<[number, number]> => {
    const edge = north ? bay.centreY + 1.1 * bay.radiusY : bay.centreY - 1.1 * bay.radiusY;
    const west = bay.centreX - 1.1 * bay.radiusX, east = bay.centreX + 1.1 * bay.radiusX;
    return [[west, bay.centreY], [east, bay.centreY], [east, edge], [west, edge], [west, bay.centreY]];
  };
  await Zone.create({ projectId: project.id, name: "North reach", sortOrder: 1, polygonGeoJson: JSON.stringify({ type: "Polygon", coordinates: [lonLatRing(half(true))] }) });
  await Zone.create({ projectId: project.id, name: "South reach", sortOrder: 2, polygonGeoJson: JSON.stringify({ type: "Polygon", coordinates: [lonLatRing(half(false))] }) });

  const directory = mkdtempSync(join(tmpdir(), "firmsand-bench-map-"));
  process.env.UPLOAD_DIR = directory;
  try {
    const surveys = syntheticSurveys(bay, soundings, 20261202);
    const files = [
      { kind: "baseline" as const, surveyedOn: "2026-10-01", name: "bay-baseline.csv", points: surveys.before, firm: surveys.firm },
      { kind: "progress" as const, surveyedOn: "2026-11-15", name: "bay-progress.csv", points: surveys.after, firm: null },
    ];
    for (const file of files) {
      const path = join(directory, file.name);
      writeSurveyCsv(path, file.points, file.firm);
      const importStarted = performance.now();
      const staged = await writeStagedFile(Readable.toWeb(createReadStream(path)) as ReadableStream<Uint8Array>, file.name);
      const outcome = await importSurveyFile({
        projectId: project.id,
        userId: user.id,
        staged,
        options: { kind: file.kind, surveyedOn: file.surveyedOn, timeZone: "UTC", waterSurfaceElevation: 0, fileHasElevations: false, datum: "NAVD88", crs: CRS, lengthUnit: "m", surveyOrder: "1a" },
        choices: { excludeRows: [], excludeErrorRows: false, outside: "keep", acceptSameFile: true },
      });
      if (!outcome.ok) throw new Error(`the ${file.kind} survey was refused: ${outcome.preview.blockers.join(" ")} ${outcome.preview.fileProblems.join(" ")}`);
      console.log(`  seeded ${file.kind} survey: ${outcome.committed.soundingCount.toLocaleString("en-US")} soundings (${(statSync(path).size / 1e6).toFixed(1)} MB) in ${((performance.now() - importStarted) / 1000).toFixed(1)} s`);
    }
  } finally {
    rmSync(directory, { recursive: true, force: true });
  }
  return { projectId: project.id, userId: user.id, email, seconds: (performance.now() - started) / 1000, reused: false };
}

async function cleanUp(projectId: number | null, userId: number | null) {
  if (projectId !== null) {
    await Survey.destroy({ where: { projectId } });
    await Zone.destroy({ where: { projectId } });
    await Membership.destroy({ where: { projectId } });
    await Project.destroy({ where: { id: projectId } });
  }
  if (userId !== null) {
    await Membership.destroy({ where: { userId } });
    await User.destroy({ where: { id: userId } });
  }
}

/** Every request must stay on this machine: anything else fails the bench. */
const outside: string[] = [];
function isLocal(url: string): boolean {
  const { protocol, hostname } = new URL(url);
  if (protocol === "data:" || protocol === "blob:" || protocol === "about:") return true;
  return hostname === "127.0.0.1";
}

async function signedInContext(browser: Browser, email: string): Promise<BrowserContext> {
  const context = await browser.newContext({ baseURL: base.origin, viewport: { width: 1280, height: 900 } });
  // Watched, not intercepted: Playwright's request interception turns the HTTP cache off, and the
  // warm load is about the cache. Other hosts do not resolve (the launch's host rules) and fail the bench.
  context.on("request", (request) => {
    if (!isLocal(request.url())) outside.push(request.url());
  });
  // Signed in with the login form's POST through the context's own cookie jar, so the browser's
  // cache is still empty when the map is opened.
  const password = demo ? DEMO_MANAGER.password : PASSWORD;
  const response = await context.request.post("/login", { form: { email, password, next: "" }, headers: { Origin: base.origin }, maxRedirects: 0 });
  if (response.status() !== 302) throw new Error(`sign-in answered ${response.status()}, not a redirect`);
  return context;
}

interface RequestFigures {
  url: string;
  status: number;
  encoded: number;
  decoded: number;
  fromCache: boolean;
  done: boolean;
}

/** Records every network request of the page through the DevTools protocol. */
async function recordNetwork(page: Page): Promise<{ requests: Map<string, RequestFigures>; session: CDPSession }> {
  const session = await page.context().newCDPSession(page);
  const requests = new Map<string, RequestFigures>();
  session.on("Network.requestWillBeSent", (event) => {
    if (!isLocal(event.request.url)) outside.push(event.request.url);
    // blob: and data: URLs (the cells handed to the map's worker) never touch the network.
    if (!/^https?:/.test(event.request.url)) return;
    requests.set(event.requestId, { url: event.request.url, status: 0, encoded: 0, decoded: 0, fromCache: false, done: false });
  });
  session.on("Network.responseReceived", (event) => {
    const request = requests.get(event.requestId);
    if (request) {
      request.status = event.response.status;
      request.fromCache = Boolean(event.response.fromDiskCache || event.response.fromPrefetchCache);
    }
  });
  session.on("Network.requestServedFromCache", (event) => {
    const request = requests.get(event.requestId);
    if (request) request.fromCache = true;
  });
  session.on("Network.dataReceived", (event) => {
    const request = requests.get(event.requestId);
    if (request) request.decoded += event.dataLength;
  });
  session.on("Network.loadingFinished", (event) => {
    const request = requests.get(event.requestId);
    if (request) {
      request.encoded = event.encodedDataLength;
      request.done = true;
    }
  });
  session.on("Network.loadingFailed", (event) => {
    const request = requests.get(event.requestId);
    if (request) request.done = true;
  });
  await session.send("Network.enable");
  return { requests, session };
}

// Installed before any page script: notes when (performance.now()) the map element first gets
// data-cells-drawn, how (data-cells-drawn-as: the quick-look image of a large grid, or the cell
// shapes) and whether MapLibre really has it on screen then (rendered cell features, or the quick
// look's image loaded); and when the cell shapes are drawn, if that came later.
function watchDrawn() {
  type Drawn = { at: number; count: string; as: string; rendered: number };
  const record = window as unknown as { benchDrawn?: Drawn; benchShapes?: number; benchOnScreen?: number };
  type BenchMap = { queryRenderedFeatures: (options: { layers: string[] }) => unknown[]; getLayer: (id: string) => unknown; isSourceLoaded: (id: string) => boolean };
  const observer = new MutationObserver((mutations) => {
    for (const mutation of mutations) {
      const element = mutation.target as Element;
      const count = element.getAttribute("data-cells-drawn");
      if (count === null) continue;
      const as = element.getAttribute("data-cells-drawn-as") ?? "shapes";
      const at = performance.now();
      const map = (window as unknown as { firmsandMap?: BenchMap }).firmsandMap;
      if (!record.benchDrawn) {
        const quickLookShown = as === "quick look" && map && map.getLayer("cells-quick-look") && map.isSourceLoaded("cells-quick-look");
        const rendered = !map ? -1 : as === "quick look" ? (quickLookShown ? Number(count) : 0) : map.queryRenderedFeatures({ layers: ["cells-fill"] }).length;
        record.benchDrawn = { at, count, as, rendered };
        // On screen: a task after this one runs once the frame it ends has been committed to the
        // compositor, which in software GL first reads the map's canvas back (and so waits for
        // every draw the GPU process still had queued). Posted as a user-blocking task, so it runs
        // before the page's own tasks queued meanwhile (a large grid's shapes are built in a timer
        // task queued in that frame: a plain timer here counted them, 0.4–1 s on the bay).
        // (No named function here: the script is sent to the page as text, without tsx's helpers.)
        const scheduler = (window as unknown as { scheduler?: { postTask(task: () => void, options: { priority: string }): Promise<unknown> } }).scheduler;
        if (scheduler) void scheduler.postTask(() => (record.benchOnScreen = performance.now()), { priority: "user-blocking" });
        else setTimeout(() => (record.benchOnScreen = performance.now()), 0);
      }
      if (as === "shapes") {
        record.benchShapes = at;
        observer.disconnect();
        // A large grid: how long the page's main thread was held at a time from the quick look on
        // screen to the shapes drawn (a pan or a click waits that long).
        const quickLookAt = record.benchOnScreen;
        if (record.benchDrawn?.as === "quick look" && quickLookAt !== undefined) {
          const tasks = [...longTasks, ...tasksObserver.takeRecords()].filter((task) => task.startTime >= quickLookAt && task.startTime < at);
          const longest = tasks.reduce((most, task) => Math.max(most, task.duration), 0);
          marks[`longest main-thread task between the quick look and the shapes: ${Math.round(longest)} ms (${tasks.length} over 50 ms, ${Math.round(tasks.reduce((sum, task) => sum + task.duration, 0))} ms in all)`] = at;
        }
        tasksObserver.disconnect();
      }
    }
  });
  // The page's main-thread tasks over 50 ms (the browser's long tasks).
  const longTasks: PerformanceEntry[] = [];
  const tasksObserver = new PerformanceObserver((list) => longTasks.push(...list.getEntries()));
  tasksObserver.observe({ type: "longtask" });
  observer.observe(document, { subtree: true, attributes: true, attributeFilter: ["data-cells-drawn", "data-cells-drawn-as"] });
  // Stages inside the map, for the breakdown: its style loaded, the cells parsed and indexed in its
  // worker (the cells source's metadata after the style's empty one), frames drawn until "drawn".
  const marks: Record<string, number> = {};
  (window as unknown as { benchMarks?: Record<string, number> }).benchMarks = marks;
  const timer = setInterval(() => {
    type Listener = (event: { sourceId?: string; sourceDataType?: string }) => void;
    const map = (window as unknown as { firmsandMap?: { on: (type: string, listener: Listener) => void; getStyle: () => { sources: object }; isSourceLoaded: (id: string) => boolean } }).firmsandMap;
    if (!map) return;
    clearInterval(timer);
    marks["map created"] = performance.now();
    let metadata = 0;
    let frames = 0;
    let loaded = false;
    map.on("load", () => {
      marks["map style loaded"] = performance.now();
      loaded = true;
    });
    // Each of MapLibre's frames before the load, with the sources still loading then. The map holds
    // their drawing back (app/components/map/hold-frames.ts): the app's mark "first complete frame
    // (N held before it)" says how many were not drawn.
    let sourceIds: string[] | null = null;
    map.on("render", () => {
      if (loaded) return;
      sourceIds ??= Object.keys(map.getStyle().sources);
      const loading = sourceIds.filter((id) => !map.isSourceLoaded(id));
      marks[`frame ${Object.keys(marks).filter((mark) => mark.startsWith("frame ")).length + 1} before the load (loading: ${loading.join(", ") || "none"})`] = performance.now();
    });
    map.on("sourcedata", (event) => {
      if (event.sourceId === "cells" && event.sourceDataType === "metadata" && ++metadata === 2) marks["cells parsed in the map's worker"] = performance.now();
    });
    map.on("render", () => {
      if (metadata >= 2 && !record.benchDrawn) marks["frames drawn after the cells were parsed"] = ++frames;
    });
  }, 5);
}

interface LoadFigures {
  seconds: number;
  wallSeconds: number;
  drawnCount: number;
  /** "quick look" (one pixel per cell, a large grid's first paint) or "shapes". */
  drawnAs: string;
  rendered: number;
  requests: RequestFigures[];
  marks: Record<string, number>;
  waterfall: Array<{ path: string; start: number; firstByte: number; end: number }>;
  /** How long the bench waited for Chromium to go quiet before it navigated (null: it never did). */
  quietAfterMs: number | null;
}

/** How quiet Chromium must be before a load starts: CPU time of all its processes together in a window. */
const QUIET_CPU_SECONDS = 0.02;
const QUIET_WINDOW_MS = 100;
const QUIET_AT_MOST_MS = 5_000;

/**
 * Waits until Chromium's processes (browser, renderers, GPU, network) together use less than
 * QUIET_CPU_SECONDS of CPU in a QUIET_WINDOW_MS window, read from the DevTools protocol's
 * SystemInfo.getProcessInfo. A new tab goes on starting its own renderer after `newPage` has
 * answered (about 0.6 s of CPU over 0.5 s here, the same on a blank page that loads nothing), and a
 * navigation begun then shares the two cores with it: the load would be timed against the bench's
 * own tab start, which a user who types the address into an open tab does not pay. Returns the
 * milliseconds waited, or null when Chromium never went quiet within QUIET_AT_MOST_MS.
 */
async function untilChromiumIsQuiet(): Promise<number | null> {
  if (!browserSession) throw new Error("the browser's DevTools session is not open");
  const cpuSeconds = async () => {
    const { processInfo } = (await browserSession!.send("SystemInfo.getProcessInfo")) as { processInfo: Array<{ cpuTime: number }> };
    return processInfo.reduce((sum, process) => sum + process.cpuTime, 0);
  };
  const started = performance.now();
  let before = await cpuSeconds();
  while (performance.now() - started < QUIET_AT_MOST_MS) {
    await new Promise((resolve) => setTimeout(resolve, QUIET_WINDOW_MS));
    const now = await cpuSeconds();
    if (now - before < QUIET_CPU_SECONDS) return performance.now() - started;
    before = now;
  }
  return null;
}

async function measureLoad(page: Page, projectId: number): Promise<LoadFigures> {
  const { requests, session } = await recordNetwork(page);
  const quietAfter = await untilChromiumIsQuiet();
  if (quietAfter === null) console.warn(`Chromium did not go quiet (under ${QUIET_CPU_SECONDS * 1000} ms of CPU in ${QUIET_WINDOW_MS} ms) within ${QUIET_AT_MOST_MS / 1000} s; the load starts anyway`);
  const started = performance.now();
  await page.goto(`/projects/${projectId}/map`, { waitUntil: "commit" });
  await page.waitForFunction(() => Boolean((window as unknown as { benchOnScreen?: number }).benchOnScreen), undefined, { timeout: 60_000, polling: 50 });
  const wallSeconds = (performance.now() - started) / 1000;
  // The load ends when the shapes are drawn too (clickable, clipped): the bytes and stages are whole.
  await page.waitForFunction(() => Boolean((window as unknown as { benchShapes?: number }).benchShapes), undefined, { timeout: 120_000, polling: 50 });
  const drawn = await page.evaluate(() => (window as unknown as { benchDrawn: { at: number; count: string; as: string; rendered: number } }).benchDrawn);
  const shapesAt = await page.evaluate(() => (window as unknown as { benchShapes: number }).benchShapes);
  const onScreenAt = await page.evaluate(() => (window as unknown as { benchOnScreen: number }).benchOnScreen);
  // Stages of the load, from the page's resource timings (ms since the navigation started).
  const marks = await page.evaluate(() => {
    const out: Record<string, number> = {};
    const navigation = performance.getEntriesByType("navigation")[0] as PerformanceNavigationTiming | undefined;
    if (navigation) {
      out["document requested"] = navigation.requestStart;
      out["document's first byte"] = navigation.responseStart;
      for (const timing of navigation.serverTiming) if (timing.duration > 0) out[`  (server: ${timing.name} ${timing.duration.toFixed(0)} ms)`] = navigation.responseStart;
      out["document received"] = navigation.responseEnd;
      out["DOMContentLoaded"] = navigation.domContentLoadedEventEnd;
    }
    for (const entry of performance.getEntriesByType("resource") as PerformanceResourceTiming[]) {
      const path = new URL(entry.name).pathname;
      if (/\/api\/projects\/\d+\/cells$/.test(path)) out["cells response received"] = entry.responseEnd;
      if (/\/map\/style\.json$/.test(path)) out["style received"] = entry.responseEnd;
      if (/maplibre-gl-worker/.test(path)) out["map worker script received"] = entry.responseEnd;
    }
    // The map's own user timing marks (coverage-map.tsx): what it waited for before it was made.
    for (const entry of performance.getEntriesByType("mark")) if (entry.name.startsWith("map: ")) out[entry.name] = entry.startTime;
    return { ...out, ...(window as unknown as { benchMarks: Record<string, number> }).benchMarks };
  });
  // --waterfall: every request of the load, when it was asked for and when its answer ended.
  const waterfall = !process.argv.includes("--waterfall")
    ? []
    : await page.evaluate(() =>
        (performance.getEntriesByType("resource") as PerformanceResourceTiming[]).map((entry) => ({
          path: new URL(entry.name).pathname,
          start: entry.startTime,
          firstByte: entry.responseStart,
          end: entry.responseEnd,
        })),
      );
  if (drawn.as !== "shapes") marks["cell shapes drawn (clipped, clickable as shapes)"] = shapesAt;
  marks[`cells drawn as ${drawn.as} in the map's frame`] = drawn.at;
  // Let the requests still under way finish (the assignments, say) so the byte count is whole.
  const settle = performance.now();
  while ([...requests.values()].some((request) => !request.done) && performance.now() - settle < 5_000) await page.waitForTimeout(50);
  await session.detach();
  return { seconds: onScreenAt / 1000, wallSeconds, drawnCount: Number(drawn.count), drawnAs: drawn.as, rendered: drawn.rendered, requests: [...requests.values()], marks, waterfall, quietAfterMs: quietAfter };
}

function printLoad(name: string, load: LoadFigures) {
  const total = load.requests.reduce((sum, request) => sum + request.encoded, 0);
  const decoded = load.requests.reduce((sum, request) => sum + request.decoded, 0);
  console.log(`${name}: ${load.seconds.toFixed(2)} s from navigation to ${load.drawnCount.toLocaleString("en-US")} cells drawn and on screen (${load.wallSeconds.toFixed(2)} s as seen by the driver); ${load.requests.length} requests, ${total.toLocaleString("en-US")} bytes on the wire (${(total / 1e6).toFixed(2)} MB; ${(decoded / 1e6).toFixed(2)} MB decoded)`);
  const frames = load.marks["frames drawn after the cells were parsed"];
  for (const [mark, at] of Object.entries(load.marks).filter(([mark]) => !mark.startsWith("frames")).sort((a, b) => a[1] - b[1])) console.log(`  ${(at / 1000).toFixed(2).padStart(6)} s  ${mark}`);
  for (const entry of load.waterfall) console.log(`    request ${(entry.start / 1000).toFixed(3)} → first byte ${(entry.firstByte / 1000).toFixed(3)} → end ${(entry.end / 1000).toFixed(3)} s  ${entry.path}`);
  console.log(`  ${load.seconds.toFixed(2).padStart(6)} s  that frame on screen: ${load.drawnAs} (${load.drawnAs === "shapes" ? `${load.rendered.toLocaleString("en-US")} cell features rendered in view` : `image of ${load.rendered.toLocaleString("en-US")} cells loaded`}${frames && load.drawnAs === "shapes" ? `; ${frames} frames since parsed` : ""})`);
}

function printLargest(load: LoadFigures, count = 12) {
  console.log(`  largest responses (encoded bytes on the wire, decoded bytes):`);
  for (const request of [...load.requests].sort((a, b) => b.encoded - a.encoded).slice(0, count)) {
    const path = new URL(request.url).pathname;
    console.log(`  ${request.encoded.toLocaleString("en-US").padStart(11)}  ${request.decoded.toLocaleString("en-US").padStart(11)}  ${request.status || "—"}${request.fromCache ? " (cache)" : ""}  ${path}`);
  }
}

let browser: Browser | null = null;
// The browser-wide DevTools session: the processes' CPU time (untilChromiumIsQuiet).
let browserSession: CDPSession | null = null;
let seeded: { projectId: number; userId: number } | null = null;
let failed = false;
try {
  const seeding = await seed();
  seeded = seeding;
  console.log(`seeding: ${seeding.seconds.toFixed(1)} s${seeding.reused ? " (reused the data of a --keep run)" : ""} (not part of the figures)`);
  browser = await chromium.launch({
    executablePath: chromiumPath,
    headless: true,
    args: [
      // Nothing but 127.0.0.1 resolves, so a request elsewhere fails instead of leaving the machine.
      "--host-resolver-rules=MAP * ~NOTFOUND, EXCLUDE 127.0.0.1",
      "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync",
    ],
  });
  browserSession = await browser.newBrowserCDPSession();
  // Each run: a fresh context (empty cache) for the cold load, then the same page again (warm).
  // The machine is shared, so the load average is printed and the median run is the figure.
  const loads: Array<{ cold: LoadFigures; warm: LoadFigures }> = [];
  for (let run = 0; run < runs; run++) {
    const context = await signedInContext(browser, seeding.email);
    await context.addInitScript(watchDrawn);
    const page = await context.newPage();
    // --trace DIR: a Chromium trace of the cold load (every process and thread: the page, the map's
    // worker, the GPU process), for chrome://tracing or Perfetto.
    if (traceDir) {
      mkdirSync(traceDir, { recursive: true });
      await browser.startTracing(page, { path: join(traceDir, `map-cold-${run + 1}.json`), categories: ["devtools.timeline", "disabled-by-default-devtools.timeline", "v8", "v8.execute", "toplevel", "gpu", "blink.user_timing", "loading", "netlog", "disabled-by-default-gpu.service", "gpu.angle", "disabled-by-default-gpu.decoder"] });
    }
    // --profile DIR: the page's main thread during each load, as a .cpuprofile (DevTools, speedscope).
    // The cold load's profile adds the profiler's own cost to that load's figure.
    const profiler = profileDir ? await context.newCDPSession(page) : null;
    const profiled = async <T,>(name: string, load: () => Promise<T>): Promise<T> => {
      if (!profiler || !profileDir) return load();
      await profiler.send("Profiler.enable");
      await profiler.send("Profiler.setSamplingInterval", { interval: 200 });
      await profiler.send("Profiler.start");
      const figures = await load();
      const { profile } = await profiler.send("Profiler.stop");
      mkdirSync(profileDir, { recursive: true });
      writeFileSync(join(profileDir, `map-${name}-${run + 1}.cpuprofile`), JSON.stringify(profile));
      return figures;
    };
    const cold = await profiled("cold", () => measureLoad(page, seeding.projectId));
    if (traceDir) await browser.stopTracing();
    const warm = await profiled("warm", () => measureLoad(page, seeding.projectId));
    await context.close();
    loads.push({ cold, warm });
    const quiet = (load: LoadFigures) => (load.quietAfterMs === null ? "never" : `${(load.quietAfterMs / 1000).toFixed(1)} s`);
    console.log(`run ${run + 1}/${runs}: cold ${cold.seconds.toFixed(2)} s, warm ${warm.seconds.toFixed(2)} s (load average ${loadavg()[0].toFixed(1)} on ${availableParallelism()} CPUs; Chromium quiet after ${quiet(cold)} / ${quiet(warm)})`);
    if (cold.rendered <= 0 || warm.rendered <= 0) {
      failed = true;
      console.error(`data-cells-drawn was set while the cells layer had rendered ${cold.rendered} (cold) / ${warm.rendered} (warm) features: the "drawn" signal came too early`);
    }
    if (cold.drawnCount < FEWEST_CELLS) {
      failed = true;
      console.error(`only ${cold.drawnCount} cells were drawn; the bench wants at least ${FEWEST_CELLS.toLocaleString("en-US")}`);
    }
  }
  const median = (values: number[]) => [...values].sort((a, b) => a - b)[Math.floor((values.length - 1) / 2)];
  const coldSeconds = median(loads.map((load) => load.cold.seconds));
  const warmSeconds = median(loads.map((load) => load.warm.seconds));
  // The breakdown is the median cold run's (and the warm load that followed it).
  const { cold, warm } = loads.find((load) => load.cold.seconds === coldSeconds)!;
  const bytes = cold.requests.reduce((sum, request) => sum + request.encoded, 0);
  printLoad("cold load (fresh context, empty cache)", cold);
  printLargest(cold);
  printLoad("warm load (same context, cached assets; cells read again)", warm);
  console.log(`coverage map of ${demo ? "the demo, " : ""}${cold.drawnCount.toLocaleString("en-US")} cells, median of ${runs}: cold ${coldSeconds.toFixed(2)} s, warm ${warmSeconds.toFixed(2)} s, ${(bytes / 1e6).toFixed(2)} MB on the wire; ratio to the goal (${GOAL_SECONDS} s, 2 MB): time ${(coldSeconds / GOAL_SECONDS).toFixed(2)}, bytes ${(bytes / GOAL_BYTES).toFixed(2)}; load average ${loadavg().map((value) => value.toFixed(2)).join(" ")}`);
} catch (error) {
  failed = true;
  console.error(error);
} finally {
  await browser?.close();
  if (seeded && !keep && !demo) await cleanUp(seeded.projectId, seeded.userId);
  else if (seeded && !demo) console.log(`kept project ${seeded.projectId} for a later --reuse run`);
  await closeSequelize();
}
if (outside.length > 0) {
  failed = true;
  console.error(`requests to hosts other than 127.0.0.1 (refused):\n  ${[...new Set(outside)].join("\n  ")}`);
}
process.exit(failed ? 1 : 0);
