import { describe, expect, it } from "vitest";
import { emergencyInfoSchema, isEmergencyInfoEmpty, missingEmergencyItems, phoneSchema } from "./emergency-info";

describe("phone numbers (practice: how crews write them)", () => {
  it.each(["911", "555-0142", "(555) 555-0199", "+1 555 555 0123", "555.555.0107", "555-0142 ext 12", "555-0142 x3"])("takes %s", (phone) => {
    expect(phoneSchema.safeParse(phone).success).toBe(true);
  });
  it.each(["call the office", "12", "555-0142!", "ext 12"])("refuses %s", (phone) => {
    expect(phoneSchema.safeParse(phone).success).toBe(false);
  });
  it("takes an empty number (not given) and trims spaces", () => {
    expect(phoneSchema.parse("  ")).toBe("");
    expect(phoneSchema.parse(" 555-0142 ")).toBe("555-0142");
  });
});

describe("emergency information (practice: a name without its phone helps nobody)", () => {
  it("refuses a hospital without its phone and a chamber phone without its name, naming the field", () => {
    const result = emergencyInfoSchema.safeParse({ hospitalName: "Harbor General", chamberPhone: "555-0170" });
    expect(result.success).toBe(false);
    const paths = result.error!.issues.map((issue) => issue.path.join("."));
    expect(paths.sort()).toEqual(["chamberName", "hospitalPhone"]);
  });

  it("lists what the sheet still lacks, in the sheet's words", () => {
    const info = emergencyInfoSchema.parse({ hospitalName: "Harbor General", hospitalPhone: "555-0142", emergencyNumber: "911" });
    expect(missingEmergencyItems(info)).toEqual(["the nearest hyperbaric chamber and its phone", "the site address", "the access point"]);
    expect(missingEmergencyItems(null)).toHaveLength(5);
    expect(isEmergencyInfoEmpty(info)).toBe(false);
  });

  it("counts a complete record as complete and a blank one as empty", () => {
    const complete = emergencyInfoSchema.parse({
      hospitalName: "Harbor General", hospitalPhone: "555-0142", chamberName: "Bayside Hyperbaric", chamberPhone: "555-0170",
      emergencyNumber: "911", siteAddress: "1 Spring Run Rd", accessPoint: "Boat ramp at the south lot",
    });
    expect(missingEmergencyItems(complete)).toEqual([]);
    expect(isEmergencyInfoEmpty(emergencyInfoSchema.parse({}))).toBe(true);
    expect(isEmergencyInfoEmpty(null)).toBe(true);
  });
});
