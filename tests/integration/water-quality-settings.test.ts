import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeSequelize } from "../../db/connection.server";
import { AuditEvent, DewateringShift, Project, User, type Role } from "~/lib/db.server";
import { presentProject, type ProjectView } from "~/lib/auth/project-view.server";
import { listMailboxMessages } from "~/lib/mail/mailbox.server";
import { deliverDue } from "~/lib/mail/outbox.server";
import { ValidationError } from "~/lib/errors";
import { readingInputSchema } from "~/lib/field-records/inputs";
import {
  samplingRoutineInWords,
  alertAddressesOf, complianceSummary, createRule, createStation, getWaterQualitySettings, listRules, recordReading, ruleInputSchema, saveWaterQualitySettings, settingsInputSchema,
} from "~/models/water-quality.server";
import { addMember, makeProject, makeUser, thrown } from "./helpers";

// The manager's water-quality settings beyond the rule: who is alerted on an exceedance (roles,
// members chosen by name, outside addresses), the sampling routine as "so many a day, at least so
// long apart", and the unit a rule is stated in. Audited like the other settings.

afterAll(closeSequelize);

let project: ProjectView;
const users = new Map<Role | "outsider", Awaited<ReturnType<typeof makeUser>>>();

const baseSettings = {
  samplingIntervalMinutes: "360", workdayStart: "07:00", workdayEnd: "19:00", samplingSource: "Permit settings-test, condition 9",
  shutdownDistance: "50", standDownWaitMinutes: "30", standDownSource: "Permit settings-test, condition 10", species: "manatee",
};

beforeAll(async () => {
  const row = await makeProject("wq-settings");
  await Project.update({ timeZone: "America/New_York" }, { where: { id: row.id } });
  project = presentProject((await Project.findByPk(row.id))!);
  for (const role of ["manager", "dive-supervisor", "dewatering", "resource-monitor", "viewer"] as Role[]) {
    const user = await makeUser(`wq-settings-${role}`);
    await addMember(user.id, project.id, role);
    users.set(role, user);
  }
  users.set("outsider", await makeUser("wq-settings-outsider"));
});

describe("alert recipients", () => {
  it("by default: every manager, dive supervisor and dewatering operator (the issue's list)", async () => {
    expect((await alertAddressesOf(project)).sort()).toEqual(["manager", "dive-supervisor", "dewatering"].map((role) => users.get(role as Role)!.email.toLowerCase()).sort());
  });

  it("a role, a member by name and an outside address: the exceedance mail goes to exactly them, and the change is audited", async () => {
    const input = settingsInputSchema.parse({
      ...baseSettings, alertRoles: ["manager"], alertUserIds: [String(users.get("viewer")!.id)], alertAddresses: "Duty-Officer@agency.example\nduty-officer@agency.example",
    });
    expect(input.alertAddresses).toEqual(["duty-officer@agency.example"]); // one address, however often and however written
    const saved = await saveWaterQualitySettings(project, users.get("manager")!, input);
    expect(saved.alertRecipients).toEqual({ roles: ["manager"], userIds: [users.get("viewer")!.id], addresses: ["duty-officer@agency.example"] });
    const expected = [users.get("manager")!.email, users.get("viewer")!.email].map((email) => email.toLowerCase()).concat("duty-officer@agency.example").sort();
    expect((await alertAddressesOf(project)).sort()).toEqual(expected);
    const audit = await AuditEvent.findOne({ where: { projectId: project.id, action: "water-quality-configured" }, order: [["id", "DESC"]] });
    expect(JSON.stringify(audit!.detail)).toContain("duty-officer@agency.example");

    await createRule(project, users.get("manager")!, ruleInputSchema.parse({ kind: "above-background", limit: 29, source: "Permit settings-test, condition 8" }));
    await createStation(project, users.get("manager")!, { name: "BG", kind: "background" });
    await createStation(project, users.get("manager")!, { name: "CP", kind: "compliance" });
    await recordReading(project, users.get("dewatering")!, readingInputSchema.parse({ station: "BG", takenAt: "2026-09-01T08:00:00-04:00", value: 5, unit: "NTU" }));
    const exceeded = await recordReading(project, users.get("dewatering")!, readingInputSchema.parse({ station: "CP", takenAt: "2026-09-01T08:20:00-04:00", value: 40, unit: "NTU" }));
    expect([...exceeded.alerted!].sort()).toEqual(expected);
    await deliverDue();
    const mails = (await listMailboxMessages()).filter((message) => message.subject.includes(`(${project.name})`));
    expect(mails.flatMap((message) => message.envelopeTo).map((address) => address.toLowerCase()).sort()).toEqual(expected);
  });

  it("a disabled account is not e-mailed, though chosen (negative control)", async () => {
    await User.update({ disabledAt: new Date() }, { where: { id: users.get("viewer")!.id } });
    expect(await alertAddressesOf(project)).not.toContain(users.get("viewer")!.email.toLowerCase());
    await User.update({ disabledAt: null }, { where: { id: users.get("viewer")!.id } });
  });

  it("refuses someone who is not a member, a bad address and an empty list, naming the field", async () => {
    const error = await thrown(() => saveWaterQualitySettings(project, users.get("manager")!, settingsInputSchema.parse({ ...baseSettings, alertUserIds: [String(users.get("outsider")!.id)] })));
    expect(error).toBeInstanceOf(ValidationError);
    expect((error as ValidationError).details[0]).toMatchObject({ field: "alertUserIds", message: expect.stringContaining(`not user ${users.get("outsider")!.id}`) });
    const bad = settingsInputSchema.safeParse({ ...baseSettings, alertRoles: ["manager"], alertAddresses: "not an address" });
    expect(bad.success ? [] : bad.error.issues.map((issue) => issue.path[0])).toEqual(["alertAddresses"]);
    const none = settingsInputSchema.safeParse({ ...baseSettings });
    expect(none.success ? [] : none.error.issues.map((issue) => [issue.path[0], issue.message])).toEqual([["alertRoles", "alert someone: choose a role, a member or an outside address"]]);
  });
});

describe("the sampling routine as samples a day", () => {
  it("twice daily at least 4 h apart (memory: a common permit form): a day with samples at 08:20 and 10:00 is one short, 12:20–19:00", async () => {
    await saveWaterQualitySettings(project, users.get("manager")!, settingsInputSchema.parse({ ...baseSettings, alertRoles: ["manager"], samplingMode: "per-day", samplesPerDay: "2", minimumGapHours: "4" }));
    const settings = await getWaterQualitySettings(project);
    expect({ mode: settings.samplingMode, perDay: settings.samplesPerDay, gap: settings.minimumGapHours }).toEqual({ mode: "per-day", perDay: 2, gap: 4 });
    await recordReading(project, users.get("dewatering")!, readingInputSchema.parse({ station: "CP", takenAt: "2026-09-01T10:00:00-04:00", value: 6, unit: "NTU" }));
    // Work was active that day (a dewatering shift was logged).
    await DewateringShift.create({
      projectId: project.id, shiftDate: "2026-09-01", startAt: "07:00", endAt: "15:00", pumpHours: 8, slurryFlowValue: 100, slurryFlowUnit: "m3/h",
      totaliserStart: null, totaliserEnd: null, totaliserUnit: null, solidsByWeight: 0.1, slurrySpecificGravity: null, solidsSpecificGravity: 2.5,
      polymerProduct: "P-1", polymerLot: null, doseMgPerL: 10, stockPercent: 0.5, drySolidsKg: 1000, neatPolymerKg: 1, notes: "", idempotencyKey: null,
    });
    const summary = await complianceSummary(project, { from: "2026-09-01", to: "2026-09-01" });
    // Counted: 08:20 (10:00 is under 4 h after it). Another could have been taken from 12:20 (computed).
    expect(summary.missed.map((gap) => ({ from: gap.from, to: gap.to, short: gap.samplesShort }))).toEqual([{ from: "2026-09-01T16:20:00.000Z", to: "2026-09-01T23:00:00.000Z", short: 1 }]);
  });

  it("refuses a routine that cannot fit in the work day, and a per-day routine without its count", () => {
    const tooMany = settingsInputSchema.safeParse({ ...baseSettings, alertRoles: ["manager"], samplingMode: "per-day", samplesPerDay: "4", minimumGapHours: "5" });
    expect(tooMany.success ? [] : tooMany.error.issues.map((issue) => issue.path[0])).toEqual(["minimumGapHours"]); // 3 × 5 h = 15 h > 12 h (computed)
    const noCount = settingsInputSchema.safeParse({ ...baseSettings, alertRoles: ["manager"], samplingMode: "per-day", samplesPerDay: "" });
    expect(noCount.success ? [] : noCount.error.issues.map((issue) => issue.path[0])).toEqual(["samplesPerDay"]);
  });

  it("twice daily no more than 4 h apart (the issue's wording; memory, a project setting): the same 08:20 and 10:00 samples leave nothing missed", async () => {
    await saveWaterQualitySettings(project, users.get("manager")!, settingsInputSchema.parse({ ...baseSettings, alertRoles: ["manager"], samplingMode: "per-day", samplesPerDay: "2", minimumGapHours: "4", gapRule: "at-most" }));
    const settings = await getWaterQualitySettings(project);
    expect({ perDay: settings.samplesPerDay, gap: settings.minimumGapHours, rule: settings.gapRule }).toEqual({ perDay: 2, gap: 4, rule: "at-most" });
    expect(samplingRoutineInWords(settings)).toBe("2 compliance samples a day, no more than 4 h apart, from 07:00 to 19:00");
    const summary = await complianceSummary(project, { from: "2026-09-01", to: "2026-09-01" });
    expect(summary.missed).toEqual([]);
    // No more than 0 h apart is no routine; a count far apart always fits the day, so it is not refused for that.
    const zero = settingsInputSchema.safeParse({ ...baseSettings, alertRoles: ["manager"], samplingMode: "per-day", samplesPerDay: "2", minimumGapHours: "0", gapRule: "at-most" });
    expect(zero.success ? [] : zero.error.issues.map((issue) => issue.path[0])).toEqual(["minimumGapHours"]);
    expect(settingsInputSchema.safeParse({ ...baseSettings, alertRoles: ["manager"], samplingMode: "per-day", samplesPerDay: "4", minimumGapHours: "5", gapRule: "at-most" }).success).toBe(true);
    expect(settingsInputSchema.safeParse({ ...baseSettings, alertRoles: ["manager"], samplingMode: "per-day", samplesPerDay: "2", minimumGapHours: "4", gapRule: "about" }).success).toBe(false);
  });
});

describe("the rule's unit", () => {
  it("NTU by default; a rule stated in FNU says so in its summary and judges FNU readings without a remark", async () => {
    expect((await listRules(project))[0].unit).toBe("NTU");
    await createRule(project, users.get("manager")!, ruleInputSchema.parse({ kind: "absolute", limit: 25, unit: "FNU", source: "Permit settings-test, condition 11 (FNU)" }));
    const [inForce] = await listRules(project);
    expect(inForce).toMatchObject({ unit: "FNU", summary: "not more than 25 FNU; where background is already above it, no increase over background" });
    const fnu = await recordReading(project, users.get("dewatering")!, readingInputSchema.parse({ station: "CP", takenAt: "2026-09-02T09:00:00-04:00", value: 20, unit: "FNU" }));
    expect(fnu.verdict).toBe("Within the limit of 25 FNU.");
    const ntu = await recordReading(project, users.get("dewatering")!, readingInputSchema.parse({ station: "CP", takenAt: "2026-09-02T09:30:00-04:00", value: 20, unit: "NTU" }));
    expect(ntu.verdict).toContain("Readings in NTU judged against a rule stated in FNU");
  });
});
