import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { PROJECT, SURVEYS } from "../../sample-data/scenario";
import { AuditEvent, CellResult, DewateringShift, Dive, DiveCell, DiveTeam, GeotextileTube, Haul, HaulSite, SedimentSample, TubeFill, type Role } from "~/lib/db.server";
import { presentProject } from "~/lib/auth/project-view.server";
import { action as shiftsAction, loader as shiftsLoader } from "~/routes/api.projects.$projectId.dewatering.shifts";
import { action as tubesAction, loader as tubesLoader } from "~/routes/api.projects.$projectId.dewatering.tubes";
import { action as tubeAction, loader as tubeLoader } from "~/routes/api.projects.$projectId.dewatering.tubes.$tubeId";
import { action as fillsAction } from "~/routes/api.projects.$projectId.dewatering.tubes.$tubeId.fills";
import { action as haulSitesAction, loader as haulSitesLoader } from "~/routes/api.projects.$projectId.haul-sites";
import { action as haulsAction } from "~/routes/api.projects.$projectId.hauls";
import { action as samplesAction } from "~/routes/api.projects.$projectId.sediment-samples";
import { loader as reconciliationLoader } from "~/routes/api.projects.$projectId.reconciliation";
import { loader as quantitiesLoader } from "~/routes/api.projects.$projectId.quantities";
import { addHaulSite } from "~/models/hauls.server";
import { presentPublicProgress } from "~/models/share-links.server";
import { DEMO_DIR, makeDemoSiteProject, postSurvey } from "./import-helpers";
import { addMember, makeUser, requestAs } from "./helpers";

// The dewatering API end to end on the demo's baseline and first progress survey: a shift's figures
// in the project's units, the tube register, haul tickets, lab samples, and the reconciliation of
// the engine's surveyed removal with what was pumped and hauled.

afterAll(closeSequelize);

let site: Awaited<ReturnType<typeof makeDemoSiteProject>>;
const users = new Map<Role, number>();
type Handler = (args: never) => Promise<Response>;
const base = () => `/api/projects/${site.project.id}`;

async function call(handler: Handler, role: Role, path: string, init: RequestInit = {}, params: Record<string, string> = {}) {
  const request = await requestAs(users.get(role)!, path, init);
  try {
    return await handler({ request, params: { projectId: String(site.project.id), ...params }, context: {} } as never);
  } catch (error) {
    if (error instanceof Response) return error;
    throw error;
  }
}
const postJson = (handler: Handler, role: Role, path: string, body: unknown, params: Record<string, string> = {}) =>
  call(handler, role, path, { method: "POST", body: JSON.stringify(body), headers: { "Content-Type": "application/json" } }, params);
const errorsOf = async (response: Response) => ((await response.json()) as { errors: Array<{ field?: string; message: string }> }).errors;

const SHIFT = {
  date: "2026-10-05", start: "07:00", end: "15:00", pumpHours: 8,
  slurryFlow: { value: 1000, unit: "gpm" }, solidsByWeight: 0.2, solidsSpecificGravity: 2.67,
  polymer: { product: "Cationic emulsion", lot: "L-2231", doseMgPerL: 5, stockPercent: 0.5 },
};

async function storedCounts() {
  const projectId = site.project.id;
  return Promise.all([DewateringShift, TubeFill, GeotextileTube, Haul, SedimentSample].map((model) => (model as typeof Haul).count({ where: { projectId } })));
}

beforeAll(async () => {
  site = await makeDemoSiteProject("dewatering");
  users.set("manager", site.users.manager);
  users.set("viewer", site.users.viewer);
  for (const role of ["dewatering", "resource-monitor"] as Role[]) {
    const user = await makeUser(`dewatering-${role}`);
    await addMember(user.id, site.project.id, role);
    users.set(role, user.id);
  }
  for (const key of ["baseline", "progress-1"]) {
    const survey = SURVEYS.find((candidate) => candidate.key === key)!;
    const stored = await postSurvey(site.project.id, site.tokens.surveyor, { path: join(DEMO_DIR, survey.fileName) }, {
      kind: survey.kind, surveyedOn: survey.surveyedOn, waterSurfaceElevation: String(survey.waterSurfaceElevationFt), timeZone: PROJECT.timeZone, datum: PROJECT.verticalDatum,
    });
    expect(stored.status).toBe(201);
  }
}, 120_000);

describe("the shift log", () => {
  it("logs a shift for the dewatering operator (201) with its figures in short tons and pounds on a feet project", async () => {
    const response = await postJson(shiftsAction as never, "dewatering", `${base()}/dewatering/shifts`, SHIFT);
    expect(response.status).toBe(201);
    const body = await response.json();
    // computed: 1,000 gpm at Cw 0.20, Gs 2.67 → 57.2 dry short tons/h (NIST gallon and ton), × 8 h
    expect(body.computed.drySolidsRate).toMatchObject({ unit: "short-ton" });
    expect(body.computed.drySolidsRate.value).toBeCloseTo(57.2, 1);
    expect(body.computed.drySolids.value).toBeCloseTo(57.2 * 8, 0);
    expect(body.computed.slurrySpecificGravity).toBeCloseTo(1.143, 3);
    expect(body.computed.solidsByVolume).toBeCloseTo(0.086, 3);
    // computed: 1,000 gpm = 227.12 m³/h at 5 mg/L = 1,135.6 g/h neat = 2.504 lb/h; ÷ 5 g/L = 227.1 L/h = 60 gal/h
    expect(body.computed.stockFeedRate).toMatchObject({ unit: "gal/h" });
    expect(body.computed.stockFeedRate.value).toBeCloseTo(60, 6);
    expect(body.computed.neatPolymer.value).toBeCloseTo(2.5035, 3);
    expect(body.computed.polymerPerDryTon.unit).toBe("lb/short-ton");
    expect(body.caution).toMatch(/safety data sheet/);
    expect(await AuditEvent.count({ where: { projectId: site.project.id, action: "dewatering-shift-recorded" } })).toBe(1);
  });

  it("takes a slurry specific gravity instead, with the project's solids specific gravity by default", async () => {
    const response = await postJson(shiftsAction as never, "manager", `${base()}/dewatering/shifts`, { ...SHIFT, date: "2026-10-06", solidsByWeight: undefined, solidsSpecificGravity: undefined, slurrySpecificGravity: 1.1, polymer: null });
    expect(response.status).toBe(201);
    const { computed, shift } = await response.json();
    // published: USACE, Cv = (1.10 − 1)/(2.65 − 1) = 0.06061 with the default Gs of mineral sediment
    expect(shift.solidsSpecificGravity).toBe(2.65);
    expect(computed.solidsByVolume).toBeCloseTo(0.06061, 5);
    expect(computed.stockFeedRate).toBeNull();
  });

  it("answers the first shift again for a repeated idempotency key, storing it once", async () => {
    const body = { ...SHIFT, date: "2026-10-07", idempotencyKey: "phone-7f3a-0001" };
    const first = await postJson(shiftsAction as never, "dewatering", `${base()}/dewatering/shifts`, body);
    const again = await postJson(shiftsAction as never, "dewatering", `${base()}/dewatering/shifts`, body);
    expect([first.status, again.status]).toEqual([201, 200]);
    expect((await again.json()).id).toBe((await first.json()).id);
    expect(await DewateringShift.count({ where: { projectId: site.project.id, shiftDate: "2026-10-07" } })).toBe(1);
  });

  it("works the flow out from a totaliser's readings, and keeps them", async () => {
    const { slurryFlow: _flow, ...withoutFlow } = SHIFT;
    const response = await postJson(shiftsAction as never, "dewatering", `${base()}/dewatering/shifts`, { ...withoutFlow, date: "2026-10-09", totaliser: { start: 1_250_000, end: 1_730_000, unit: "gal" } });
    expect(response.status).toBe(201);
    const { shift, computed } = await response.json();
    // computed: 480,000 gal over 8 pump hours = 1,000 gpm → 57.2 dry short tons/h as above
    expect(shift.slurryFlow).toMatchObject({ value: 1000, unit: "gpm" });
    expect(shift.totaliser).toEqual({ start: 1_250_000, end: 1_730_000, unit: "gal" });
    expect(computed.drySolidsRate.value).toBeCloseTo(57.2, 1);
  });

  const refusals: Array<[string, Record<string, unknown>, string]> = [
    ["neither a flow nor a totaliser", { slurryFlow: null }, "slurryFlow"],
    ["a totaliser that runs backwards", { slurryFlow: null, totaliser: { start: 500, end: 400, unit: "m3" } }, "totaliser.end"],
    ["a dose of −1", { polymer: { ...SHIFT.polymer, doseMgPerL: -1 } }, "polymer.doseMgPerL"],
    ["a stock of 0 %", { polymer: { ...SHIFT.polymer, stockPercent: 0 } }, "polymer.stockPercent"],
    ["an end before the start", { start: "15:00", end: "07:00" }, "end"],
    ["Cw above 1", { solidsByWeight: 20 }, "solidsByWeight"],
    ["a flow in an unknown unit", { slurryFlow: { value: 1000, unit: "bbl/d" } }, "slurryFlow.unit"],
    ["a tube not in the register", { tubes: ["No such tube"] }, "tubes"],
  ];
  for (const [name, change, field] of refusals) {
    it(`refuses ${name} with 422 naming ${field}, storing nothing`, async () => {
      const before = await storedCounts();
      const response = await postJson(shiftsAction as never, "dewatering", `${base()}/dewatering/shifts`, { ...SHIFT, ...change });
      expect(response.status).toBe(422);
      expect((await errorsOf(response)).map((error) => error.field)).toContain(field);
      expect(await storedCounts()).toEqual(before);
    });
  }

  it("refuses a viewer (403) and lets the viewer read the log", async () => {
    expect((await postJson(shiftsAction as never, "viewer", `${base()}/dewatering/shifts`, SHIFT)).status).toBe(403);
    const list = await call(shiftsLoader as never, "viewer", `${base()}/dewatering/shifts?from=2026-10-05&to=2026-10-06`);
    expect(list.status).toBe(200);
    expect(((await list.json()).shifts as Array<{ date: string }>).map((shift) => shift.date)).toEqual(["2026-10-06", "2026-10-05"]);
  });
});

describe("the tube register", () => {
  let tubeId: number;
  it("registers a tube with its theoretical diameter and takes fills from a shift and by hand", async () => {
    const response = await postJson(tubesAction as never, "dewatering", `${base()}/dewatering/tubes`, { name: "T-1", circumference: 30, length: 100, capacityDryMassPerLength: 5 });
    expect(response.status).toBe(201);
    const { tube } = await response.json();
    tubeId = tube.id;
    expect(tube.theoreticalDiameter).toBeCloseTo(9.55, 2); // computed: 30 ft ÷ π
    expect(tube).toMatchObject({ status: "filling", fillLevel: 0, nearCapacity: false, capacity: 500 });
    // A shift into T-1: its 457.9 dry short tons (computed above) bring the 500-ton tube past 90 %
    const shift = await postJson(shiftsAction as never, "dewatering", `${base()}/dewatering/shifts`, { ...SHIFT, date: "2026-10-08", tubes: ["t-1"] });
    expect(shift.status).toBe(201);
    expect((await shift.json()).shift.tubes).toEqual(["T-1"]);
    const fill = await postJson(fillsAction as never, "dewatering", `${base()}/dewatering/tubes/${tubeId}/fills`, { date: "2026-10-09", drySolids: 10 }, { tubeId: String(tubeId) });
    expect(fill.status).toBe(201);
    const filled = (await fill.json()).tube;
    expect(filled.fills).toHaveLength(2);
    expect(filled.drySolidsDelivered).toBeCloseTo(57.23 * 8 + 10, 0);
    expect(filled.fillLevel).toBeCloseTo(filled.drySolidsDelivered / 500, 12);
    expect(filled.nearCapacity).toBe(true);
    const register = await (await call(tubesLoader as never, "viewer", `${base()}/dewatering/tubes`)).json();
    expect(register.tubes.map((entry: { name: string }) => entry.name)).toEqual(["T-1"]);
  });

  it("refuses a second tube of the same name (409) and a fill into an unknown tube (404)", async () => {
    expect((await postJson(tubesAction as never, "manager", `${base()}/dewatering/tubes`, { name: "T-1", circumference: 30, length: 100, capacityDryMassPerLength: 5 })).status).toBe(409);
    expect((await postJson(fillsAction as never, "dewatering", `${base()}/dewatering/tubes/999999999/fills`, { date: "2026-10-09", drySolids: 1 }, { tubeId: "999999999" })).status).toBe(404);
    expect((await postJson(fillsAction as never, "viewer", `${base()}/dewatering/tubes/${tubeId}/fills`, { date: "2026-10-09", drySolids: 1 }, { tubeId: String(tubeId) })).status).toBe(403);
  });

  it("reads one tube, and moves it on through its statuses for the operator (200, audit-logged); a viewer reads but may not", async () => {
    const params = { tubeId: String(tubeId) };
    const patch = (role: Role, body: unknown, id = String(tubeId)) =>
      call(tubeAction as never, role, `${base()}/dewatering/tubes/${id}`, { method: "PATCH", body: JSON.stringify(body), headers: { "Content-Type": "application/json" } }, { tubeId: id });
    const read = await call(tubeLoader as never, "viewer", `${base()}/dewatering/tubes/${tubeId}`, {}, params);
    expect(read.status).toBe(200);
    expect((await read.json()).tube).toMatchObject({ id: tubeId, name: "T-1", status: "filling", nearCapacity: true });
    const moved = await patch("dewatering", { status: "ready-to-open" });
    expect(moved.status).toBe(200);
    expect((await moved.json()).tube.status).toBe("ready-to-open");
    expect(await AuditEvent.count({ where: { projectId: site.project.id, action: "tube-status-changed" } })).toBe(1);
    const unknown = await patch("dewatering", { status: "burst" });
    expect(unknown.status).toBe(422);
    expect((await errorsOf(unknown))[0].field).toBe("status");
    expect((await patch("viewer", { status: "opened" })).status).toBe(403);
    expect((await patch("dewatering", { status: "opened" }, "999999999")).status).toBe(404);
    expect((await call(tubeLoader as never, "viewer", `${base()}/dewatering/tubes/999999999`, {}, { tubeId: "999999999" })).status).toBe(404);
    expect((await GeotextileTube.findByPk(tubeId))!.status).toBe("ready-to-open");
  });

  it("moves a tube on the laydown area and takes it off the map (audited with where it was), refusing a bearing without a place", async () => {
    const patch = (body: unknown, headers: Record<string, string> = {}) =>
      call(tubeAction as never, "dewatering", `${base()}/dewatering/tubes/${tubeId}`, { method: "PATCH", body: JSON.stringify(body), headers: { "Content-Type": "application/json", ...headers } }, { tubeId: String(tubeId) });
    const before = (await (await call(tubeLoader as never, "viewer", `${base()}/dewatering/tubes/${tubeId}`, {}, { tubeId: String(tubeId) })).json()).tube;
    const moved = await patch({ position: { x: 612_345.5, y: 1_734_567.25 }, bearingDegrees: 45 });
    expect(moved.status).toBe(200);
    const tube = (await moved.json()).tube;
    expect(tube).toMatchObject({ position: { x: 612_345.5, y: 1_734_567.25 }, bearingDegrees: 45, status: before.status });
    expect(tube.version).not.toBe(before.version);
    const audit = await AuditEvent.findOne({ where: { projectId: site.project.id, action: "tube-moved" }, order: [["id", "DESC"]] });
    expect(audit!.detail).toMatchObject({ tube: "T-1", after: { x: 612_345.5, y: 1_734_567.25, bearingDegrees: 45 } });
    // An edit made from the version before the move is refused with the tube as it is now.
    const stale = await patch({ status: "opened" }, { "If-Match": `"${before.version}"` });
    expect(stale.status).toBe(412);
    const bearingOnly = await patch({ bearingDegrees: 90, position: null });
    expect(bearingOnly.status).toBe(422);
    expect((await errorsOf(bearingOnly))[0].field).toBe("position");
    const nothing = await patch({});
    expect(nothing.status).toBe(422);
    expect((await errorsOf(nothing))[0].field).toBe("status");
    const off = await patch({ position: null });
    expect((await off.json()).tube.position).toBeNull();
    expect((await GeotextileTube.findByPk(tubeId))!.positionX).toBeNull();
  });
});

describe("haul tickets", () => {
  it("counts a scale ticket's dry solids at its cake solids, and a body volume through the saturated cake", async () => {
    await addHaulSite(presentProject(site.project), { id: site.users.manager } as never, { name: "Tallgrass Farm", kind: "reuse", permitNumber: "AG-2026-114" });
    const scale = await postJson(haulsAction as never, "dewatering", `${base()}/hauls`, { date: "2026-10-10", ticketNumber: "41877", truck: "Truck 3", site: "tallgrass farm", load: { value: 22, unit: "short-ton" }, cakeSolidsByWeight: 0.3 });
    expect(scale.status).toBe(201);
    const { haul } = await scale.json();
    // computed: 22 wet short tons × 0.30
    expect(haul.drySolids.value).toBeCloseTo(6.6, 9);
    expect(haul).toMatchObject({ cakeSolidsFrom: "sample", site: { name: "Tallgrass Farm", permitNumber: "AG-2026-114" } });
    // no cake solids and no project default: refused, naming the field
    const none = await postJson(haulsAction as never, "dewatering", `${base()}/hauls`, { date: "2026-10-10", ticketNumber: "41878", truck: "Truck 3", site: "Tallgrass Farm", load: { value: 14, unit: "yd3" } });
    expect(none.status).toBe(422);
    expect((await errorsOf(none))[0].field).toBe("cakeSolidsByWeight");
    const again = await postJson(haulsAction as never, "dewatering", `${base()}/hauls`, { date: "2026-10-10", ticketNumber: "41877", truck: "Truck 3", site: "Tallgrass Farm", load: { value: 22, unit: "short-ton" }, cakeSolidsByWeight: 0.3 });
    expect(again.status).toBe(409);
    expect(await HaulSite.count({ where: { projectId: site.project.id } })).toBe(1);
  });

  it("lists and adds haul sites through the API: 201 for the operator, 409 for a name taken, 422 naming the field, 403 for a viewer", async () => {
    const post = (role: Role, body: unknown) => postJson(haulSitesAction as never, role, `${base()}/haul-sites`, body);
    const added = await post("dewatering", { name: "Kestrel Landfill", kind: "disposal", permitNumber: "SW-88-0412" });
    expect(added.status).toBe(201);
    expect((await added.json()).site).toMatchObject({ name: "Kestrel Landfill", kind: "disposal", permitNumber: "SW-88-0412" });
    expect((await post("manager", { name: "Kestrel Landfill", kind: "disposal", permitNumber: "SW-88-0413" })).status).toBe(409);
    const noPermit = await post("dewatering", { name: "Heron Field", kind: "reuse" });
    expect(noPermit.status).toBe(422);
    expect((await errorsOf(noPermit))[0].field).toBe("permitNumber");
    expect((await post("viewer", { name: "Viewer's site", kind: "reuse", permitNumber: "X-1" })).status).toBe(403);
    const listed = await (await call(haulSitesLoader as never, "viewer", `${base()}/haul-sites`)).json();
    expect(listed.sites.map((entry: { name: string }) => entry.name)).toEqual(["Kestrel Landfill", "Tallgrass Farm"]);
  });
});

describe("sediment samples and the reconciliation", () => {
  it("lets the resource monitor record a lab result (201) and refuses the dewatering operator (403)", async () => {
    const body = { date: "2026-09-10", percentSolids: 9, dryBulkDensity: { value: 15, unit: "lb/ft3" }, totalNitrogenMgKg: 12_000, totalPhosphorusMgKg: 800, organicMatterPercent: 62, lab: "Bayline Laboratories", reportNumber: "BL-5521" };
    expect((await postJson(samplesAction as never, "dewatering", `${base()}/sediment-samples`, body)).status).toBe(403);
    const response = await postJson(samplesAction as never, "resource-monitor", `${base()}/sediment-samples`, body);
    expect(response.status).toBe(201);
    const { sample } = await response.json();
    expect(sample.zone).toBeNull();
    expect(sample.dryBulkDensity.value).toBeCloseTo(15, 9);
    const bad = await postJson(samplesAction as never, "manager", `${base()}/sediment-samples`, { ...body, dryBulkDensity: { value: 15, unit: "lb/gal" } });
    expect(bad.status).toBe(422);
    expect((await errorsOf(bad))[0].field).toBe("dryBulkDensity.unit");
  });

  it("turns the engine's removed volume into dry mass and phosphorus, and sets pumped and hauled beside it", async () => {
    const response = await call(reconciliationLoader as never, "viewer", `${base()}/reconciliation`);
    expect(response.status).toBe(200);
    const body = await response.json();
    // The surveyed removal is the engine's, as stored per cell (never recomputed): its sum.
    const cells = await CellResult.findAll({ where: { projectId: site.project.id }, attributes: ["removedVolume", "areaInLimit"], raw: true });
    const removedYd3 = cells.filter((cell) => cell.areaInLimit > 0).reduce((sum, cell) => sum + cell.removedVolume, 0);
    expect(removedYd3).toBeGreaterThan(0);
    expect(body.project.surveyedRemoved.value).toBeCloseTo(removedYd3, 6);
    // computed: yd³ × 27 ft³ × 15 lb/ft³ × 800 mg/kg × 10⁻⁶ (one project-wide sample), to the 6 ppm of the survey foot
    expect(body.project.phosphorusRemoved.value / (removedYd3 * 27 * 15 * 800e-6)).toBeCloseTo(1, 4);
    expect(body.project.nitrogenRemoved.value / (removedYd3 * 27 * 15 * 12_000e-6)).toBeCloseTo(1, 4);
    // the zone rows add up to the project
    const zoneSum = body.zones.reduce((sum: number, zone: { phosphorusRemoved: { value: number } }) => sum + zone.phosphorusRemoved.value, 0);
    expect(zoneSum).toBeCloseTo(body.project.phosphorusRemoved.value, 6);
    // pumped = the shifts' dry solids; hauled = the one ticket's 6.6 dry short tons
    const pumpedKg = Number(await DewateringShift.sum("drySolidsKg", { where: { projectId: site.project.id } }));
    expect(body.project.dryMassPumped.value).toBeCloseTo(pumpedKg / 907.18474, 6);
    expect(body.project.dryMassHauled.value).toBeCloseTo(6.6, 9);
    const surveyed = body.project.dryMassFromSurveys.value;
    expect(body.project.pumpedVersusSurveyedPercent).toBeCloseTo(((body.project.dryMassPumped.value - surveyed) / surveyed) * 100, 9);
    expect(body.assumptions.length).toBeGreaterThan(3);
    // The public share page offers the same headline, in whole pounds.
    const publicView = await presentPublicProgress(site.project.id, { publicText: "" });
    expect(publicView!.nutrientsRemoved).toEqual({ phosphorus: Math.round(body.project.phosphorusRemoved.value), nitrogen: Math.round(body.project.nitrogenRemoved.value), label: "lb" });
  });

  it("reconciles a pay period: the period's removed volume per zone, and only the shifts and tickets dated in it", async () => {
    // Shifts on the baseline's date (before the period), on the later survey's date (in it) and after it.
    for (const date of ["2026-09-08", "2026-09-29", "2026-09-30"]) {
      expect((await postJson(shiftsAction as never, "dewatering", `${base()}/dewatering/shifts`, { ...SHIFT, date, polymer: undefined })).status).toBe(201);
    }
    const quantities = await (await call(quantitiesLoader as never, "manager", `${base()}/quantities`)).json();
    const [from, to] = [quantities.from, quantities.to];
    expect([from.surveyedOn, to.surveyedOn]).toEqual(["2026-09-08", "2026-09-29"]);
    const response = await call(reconciliationLoader as never, "viewer", `${base()}/reconciliation?from=${from.id}&to=${to.id}`);
    expect(response.status).toBe(200);
    const body = await response.json();
    expect(body.period).toEqual({ from: "2026-09-08", to: "2026-09-29" });
    // The zones' removed volume is the pay period's (the quantities API's rows), zone by zone.
    expect(body.zones.map((zone: { name: string; surveyedRemoved: { value: number } }) => [zone.name, zone.surveyedRemoved.value]))
      .toEqual(quantities.zones.map((zone: { name: string; removedVolume: number }) => [zone.name, zone.removedVolume]));
    // computed: the listed shifts filtered by their dates here (after 09-08 up to and including 09-29), summed
    const { shifts } = await (await call(shiftsLoader as never, "viewer", `${base()}/dewatering/shifts`)).json();
    const inPeriod = shifts.filter((shift: { date: string }) => shift.date > "2026-09-08" && shift.date <= "2026-09-29");
    expect(inPeriod.some((shift: { date: string }) => shift.date === "2026-09-29")).toBe(true);
    const expected = inPeriod.reduce((sum: number, shift: { computed: { drySolids: { value: number } | null } }) => sum + (shift.computed.drySolids?.value ?? 0), 0);
    expect(body.project.dryMassPumped.value).toBeCloseTo(expected, 6);
    const whole = await (await call(reconciliationLoader as never, "viewer", `${base()}/reconciliation`)).json();
    expect(whole.period).toBeNull();
    expect(whole.project.dryMassPumped.value).toBeGreaterThan(body.project.dryMassPumped.value);
    expect(body.assumptions[0]).toContain("between the surveys of 2026-09-08 and 2026-09-29");
    // A malformed month is named.
    const bad = await call(reconciliationLoader as never, "viewer", `${base()}/reconciliation?month=2026-13`);
    expect(bad.status).toBe(422);
    expect((await errorsOf(bad))[0].field).toBe("month");
  });

  it("attributes pumped and hauled solids to zones by the dives in the shifts' hours, with the rest unattributed, rows adding up to the project", async () => {
    // A shift on a day of its own (no other test logs one on 2026-10-21), and one dive in its hours over a cell of each of two zones.
    const logged = await postJson(shiftsAction as never, "dewatering", `${base()}/dewatering/shifts`, { ...SHIFT, date: "2026-10-21", polymer: undefined });
    expect(logged.status).toBe(201);
    const shiftTons = (await logged.json()).computed.drySolids.value as number;
    const zoned = await CellResult.findAll({ where: { projectId: site.project.id }, attributes: ["row", "col", "label", "zoneId"], order: [["row", "ASC"], ["col", "ASC"]], raw: true });
    const [first, second] = [...new Map(zoned.filter((cell) => cell.zoneId !== null).map((cell) => [cell.zoneId, cell])).values()];
    expect(second).toBeDefined();
    const team = await DiveTeam.create({ projectId: site.project.id, name: "Attribution team", hoses: [{ name: "Hose A", diameter: 6, diameterUnit: "in" }], members: [] });
    const dive = await Dive.create({ projectId: site.project.id, diveDate: "2026-10-21", teamId: team.id, diverName: "Test diver", leftSurfaceAt: "08:00", leftBottomAt: "10:00", bottomMinutes: 120, maxDepth: 8, notes: "", recordedById: null });
    for (const cell of [first, second]) await DiveCell.create({ diveId: dive.id, projectId: site.project.id, row: cell.row, col: cell.col, label: cell.label });

    const body = await (await call(reconciliationLoader as never, "viewer", `${base()}/reconciliation`)).json();
    type Row = { zoneId: number | null; dryMassPumped: { value: number }; dryMassHauled: { value: number } };
    const rowOf = (zoneId: number | null) => body.zones.find((zone: Row) => zone.zoneId === zoneId) as Row;
    // computed: the dive's 120 min split evenly over its two cells, so each zone has half the shift's dry solids
    expect(rowOf(first.zoneId).dryMassPumped.value).toBeCloseTo(shiftTons / 2, 9);
    expect(rowOf(second.zoneId).dryMassPumped.value).toBeCloseTo(shiftTons / 2, 9);
    // every other shift had no dive in its hours
    expect(body.unattributed.dryMassPumped.value).toBeCloseTo(body.project.dryMassPumped.value - shiftTons, 6);
    // hauled in the pumped proportions: 6.6 × (half the shift ÷ all pumped)
    expect(rowOf(first.zoneId).dryMassHauled.value).toBeCloseTo((6.6 * shiftTons) / 2 / body.project.dryMassPumped.value, 9);
    // the rows add up to the project (invariant)
    const total = (pick: (row: Row) => number) => body.zones.reduce((sum: number, row: Row) => sum + pick(row), 0);
    expect(total((row) => row.dryMassPumped.value) + body.unattributed.dryMassPumped.value).toBeCloseTo(body.project.dryMassPumped.value, 6);
    expect(total((row) => row.dryMassHauled.value) + body.unattributed.dryMassHauled.value).toBeCloseTo(body.project.dryMassHauled.value, 6);
    expect(body.attribution.rule).toContain("attributed, not measured");
    expect(body.assumptions).toContain(body.attribution.rule);
  });
});
