import { z } from "zod";

/**
 * The project's emergency information, as the day sheet carries it to the boat: where the nearest
 * hospital and hyperbaric chamber are and how to ring them, the emergency services number, and
 * where an ambulance finds the crew (the site's address and the access point on the shore).
 * Phone numbers are read leniently (digits with spaces, dashes, dots, brackets, a leading + and an
 * extension), since crews write them every way; a name given without its phone is refused, as a
 * hospital on the sheet without a number helps nobody in an emergency.
 */

/** A telephone number as people write it: at least 3 digits (an emergency services number is 3). */
const PHONE = /^\+?[0-9 ()\-./]*[0-9][0-9 ()\-./]*(\s*(x|ext\.?)\s*[0-9]{1,6})?$/i;

export const phoneSchema = z
  .string()
  .trim()
  .max(40, "a phone number is at most 40 characters")
  .refine((value) => value === "" || (PHONE.test(value) && (value.match(/[0-9]/g) ?? []).length >= 3), "write a phone number with its digits, e.g. 555-0142 or +1 555 0142 ext 12");

const text = (max: number) => z.string().trim().max(max, `at most ${max} characters`);

export const emergencyInfoSchema = z
  .object({
    hospitalName: text(200).default(""),
    hospitalPhone: phoneSchema.default(""),
    chamberName: text(200).default(""),
    chamberPhone: phoneSchema.default(""),
    emergencyNumber: phoneSchema.default(""),
    siteAddress: text(500).default(""),
    accessPoint: text(500).default(""),
  })
  .superRefine((info, context) => {
    if (info.hospitalName && !info.hospitalPhone) context.addIssue({ code: "custom", path: ["hospitalPhone"], message: "give the hospital's phone number with its name" });
    if (info.hospitalPhone && !info.hospitalName) context.addIssue({ code: "custom", path: ["hospitalName"], message: "name the hospital the phone number rings" });
    if (info.chamberName && !info.chamberPhone) context.addIssue({ code: "custom", path: ["chamberPhone"], message: "give the hyperbaric chamber's phone number with its name" });
    if (info.chamberPhone && !info.chamberName) context.addIssue({ code: "custom", path: ["chamberName"], message: "name the hyperbaric chamber the phone number rings" });
  });
export type EmergencyInfo = z.output<typeof emergencyInfoSchema>;

/** The items a day sheet needs, in the words the sheet uses, with the fields that make each one. */
const ITEMS: Array<{ label: string; has: (info: EmergencyInfo) => boolean }> = [
  { label: "the nearest hospital and its phone", has: (info) => Boolean(info.hospitalName && info.hospitalPhone) },
  { label: "the nearest hyperbaric chamber and its phone", has: (info) => Boolean(info.chamberName && info.chamberPhone) },
  { label: "the emergency services number", has: (info) => Boolean(info.emergencyNumber) },
  { label: "the site address", has: (info) => Boolean(info.siteAddress) },
  { label: "the access point", has: (info) => Boolean(info.accessPoint) },
];

/** True when nothing at all is set (the stored value is cleared rather than kept empty). */
export function isEmergencyInfoEmpty(info: EmergencyInfo | null): boolean {
  return !info || Object.values(info).every((value) => value === "");
}

/** What the day sheet still lacks, in its words; every item when nothing is set. */
export function missingEmergencyItems(info: EmergencyInfo | null): string[] {
  if (!info) return ITEMS.map((item) => item.label);
  return ITEMS.filter((item) => !item.has(info)).map((item) => item.label);
}
