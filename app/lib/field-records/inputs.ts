import { z } from "zod";
import { CUSTODY_PURPOSES, FIND_CATEGORIES, FIND_STATUSES } from "../../../shared/finds/finds";
import { TUBE_STATUSES } from "../../../shared/dewatering/tubes";
import { DEFAULT_JAR_VOLUME_ML, JAR_CLARITIES } from "../../../shared/dewatering/jar-test";
import { flowUnitSchema, HAND_VOLUME_UNITS, litresFrom, litresTo, measureLabel } from "../../../shared/units";
import { TURBIDITY_UNITS } from "../../../shared/water-quality/turbidity-rule";
import { minutesOfClock as minutesOf } from "../../../shared/local-time";

/**
 * What a field record must hold to be stored: the dive log, turbidity readings, finds, their status
 * and custody handovers, wildlife sightings, a geotextile tube's status and fills, the dewatering
 * shift log, jar tests and haul tickets. The server's models check every request with these, and
 * the field page checks an entry with the same schemas before it joins the offline queue, so the
 * device refuses what the server would (browser-safe: zod and shared constants only).
 */

export const workDateSchema = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, "a work date is written YYYY-MM-DD")
  .refine((value) => !Number.isNaN(Date.parse(`${value}T00:00:00Z`)) && new Date(`${value}T00:00:00Z`).toISOString().startsWith(value), "that date does not exist");

const clock = z
  .string()
  .trim()
  .regex(/^([01]\d|2[0-3]):[0-5]\d$/, "a time is written HH:MM (24-hour clock)");

/** Minutes from 00:00. */

export const diveInputSchema = z
  .object({
    date: workDateSchema,
    /** The team's name or id. */
    team: z.union([z.string().trim().min(1).max(120), z.number().int().positive()]),
    /** A name on the team's roster, or, with `visitor`, anyone's. */
    diver: z.string().trim().min(1, "name the diver").max(120),
    /** The diver is not on the team's roster (a visitor diving with the team). */
    visitor: z.boolean().default(false),
    /** When the diver left the surface and left the bottom, HH:MM; or the bottom time alone. */
    leftSurface: clock.nullish(),
    leftBottom: clock.nullish(),
    bottomMinutes: z.number().int().min(1, "a bottom time is at least 1 minute").max(600, "a bottom time over 600 minutes is not a dive this log takes").nullish(),
    /** Maximum depth reached, project length unit. */
    maxDepth: z.number().finite().positive("the maximum depth is below the surface, so more than 0").max(400),
    cells: z.array(z.string().trim().min(1).max(16)).min(1, "name at least one cell the dive worked").max(500),
    notes: z.string().max(4000).default(""),
  })
  .superRefine((input, context) => {
    const hasTimes = Boolean(input.leftSurface) || Boolean(input.leftBottom);
    if (hasTimes && !(input.leftSurface && input.leftBottom)) {
      context.addIssue({ code: "custom", path: [input.leftSurface ? "leftBottom" : "leftSurface"], message: "give both times (left surface and left bottom), or the bottom time alone" });
      return;
    }
    if (input.leftSurface && input.leftBottom) {
      const span = minutesOf(input.leftBottom) - minutesOf(input.leftSurface);
      if (span <= 0) context.addIssue({ code: "custom", path: ["leftBottom"], message: "the diver leaves the bottom after leaving the surface, on the same day" });
      else if (input.bottomMinutes != null && input.bottomMinutes !== span) {
        context.addIssue({ code: "custom", path: ["bottomMinutes"], message: `the times give ${span} minutes, not ${input.bottomMinutes}; give one or the other` });
      }
    } else if (input.bottomMinutes == null) {
      context.addIssue({ code: "custom", path: ["bottomMinutes"], message: "give the bottom time in minutes, or the times the diver left the surface and the bottom" });
    }
  });

/** Nephelometric turbidity, NTU or FNU. */
export const ntu = z.number().finite().min(0, "turbidity is 0 NTU or more").max(10_000, "more than 10,000 NTU is not a reading this log takes");

export const instantSchema = (what: string) => z.iso.datetime({ offset: true, message: `give ${what} as an ISO 8601 date-time with its offset, e.g. 2031-05-06T09:30:00-04:00` });

export const readingInputSchema = z.object({
  /** The station's id or name. */
  station: z.union([z.number().int().positive(), z.string().trim().min(1).max(120)], { message: "name the station (its name or id)" }),
  takenAt: instantSchema("the time the sample was taken"),
  value: ntu,
  unit: z.enum(TURBIDITY_UNITS, { message: "the unit is NTU or FNU" }),
  /** Sample depth, project length unit. */
  depth: z.number().finite().min(0).max(400).nullish(),
  instrument: z.string().trim().max(120).nullish(),
  calibratedAt: instantSchema("the last calibration check").nullish(),
  sampledBy: z.string().trim().max(120).nullish(),
  note: z.string().max(4000).nullish(),
  ph: z.number().finite().min(0).max(14, "pH is between 0 and 14").nullish(),
  dissolvedOxygen: z.number().finite().min(0).max(30, "dissolved oxygen over 30 mg/L is not a reading this log takes").nullish(),
  temperature: z.number().finite().min(-5).max(60).nullish(),
  /** Sent again with the same key (an offline form re-sent), the reading is stored once. */
  idempotencyKey: z.string().trim().min(1).max(64).nullish(),
});

export const requiredText = (label: string, max = 120) => z.string().trim().min(1, `write the ${label}`).max(max, `the ${label} is at most ${max} characters`);
export const optionalText = (max: number) => z.string().trim().max(max, `at most ${max} characters`).nullish().transform((value) => value || null);
const length = (label: string) => z.number({ message: `${label} is a number in the project's length unit` }).finite().min(0, `${label} cannot be negative`).max(10_000, `${label} is too large`).nullish();

/** Where, when and by whom something came up: shared by a find and a basket load. */
const provenienceFields = {
  condition: optionalText(200),
  cell: z.string().trim().min(1).max(16).nullish(),
  position: z.object({ x: z.number().finite(), y: z.number().finite() }, { message: "the position is {\"x\", \"y\"} in the project's coordinates" }).nullish(),
  depthBelowSurface: length("the depth below the water surface"),
  depthInMuck: length("the depth within the muck"),
  foundAt: z.iso.datetime({ offset: true, message: "foundAt is a date and time with its offset, e.g. 2026-11-03T10:42:00-05:00" }),
  diveId: z.number().int().positive().nullish(),
  /** The team it came from when no dive is named (from the day plan); a dive names its own team. */
  teamId: z.number().int().positive().nullish(),
  finder: optionalText(120),
  fieldTag: optionalText(60),
};

export const findInputSchema = z
  .object({
    category: z.enum(FIND_CATEGORIES, { message: `the category is one of ${FIND_CATEGORIES.join(", ")}` }),
    description: requiredText("description", 4000),
    material: optionalText(120),
    count: z.number({ message: "the count is a whole number" }).int("the count is a whole number").min(1, "the count is at least 1").max(100_000).default(1),
    taxon: optionalText(120),
    element: optionalText(120),
    ...provenienceFields,
    idempotencyKey: z.string().trim().min(8, "an idempotency key has at least 8 characters").max(80).nullish(),
  })
  .superRefine((input, context) => {
    if (input.category !== "faunal" && (input.taxon || input.element)) {
      context.addIssue({ code: "custom", path: ["taxon"], message: "taxon and element are for faunal finds" });
    }
  });
export type FindInput = z.input<typeof findInputSchema>;

/** What a basket may hold as counted lots: a cultural object or human remains is logged on its own. */
export const BASKET_CATEGORIES = ["faunal", "historic-debris", "modern-debris"] as const;

/**
 * The largest volume one basket line takes: a cubic metre (about 264 US gallons or 35 ft³), more
 * than a lift basket filled by hand holds (practice); a larger figure is a typing slip.
 */
export const BASKET_LINE_MAX_LITRES = 1000;

/**
 * One basket load brought up on a dive: a line per kind of thing in it (its category, what it is,
 * and how many, how much by volume, or both), all sharing one provenience. Each line becomes a
 * catalogue entry with its count and volume.
 */
export const basketLoadInputSchema = z
  .object({
    lines: z
      .array(
        z.object({
          category: z.enum(FIND_CATEGORIES, { message: `the category is one of ${BASKET_CATEGORIES.join(", ")}` }),
          description: requiredText("description of what is in this line", 4000),
          /** Checked in the refinement below, where the line's number is known. */
          count: z.number({ message: "the count is a whole number" }).nullish(),
          /** The volume the line filled, in the unit it was measured in (US gallons, cubic feet, litres, cubic metres). */
          volume: z
            .object({
              value: z.number({ message: "the volume is a number" }).finite("the volume is a number"),
              unit: z.enum(HAND_VOLUME_UNITS, { message: `the volume's unit is one of ${HAND_VOLUME_UNITS.join(", ")}` }),
            }, { message: "the volume is {\"value\", \"unit\"}, e.g. {\"value\": 2.5, \"unit\": \"gal\"}" })
            .nullish(),
          material: optionalText(120),
          taxon: optionalText(120),
          element: optionalText(120),
        }),
        { message: "the lines are a list of {category, description, count and/or volume}" },
      )
      .min(1, "give at least one line: what the basket held, and how many or how much")
      .max(30, "at most 30 lines in one basket"),
    ...provenienceFields,
    /** A page's key against a double submit (the API takes the Idempotency-Key header instead). */
    idempotencyKey: z.string().trim().min(8, "an idempotency key has at least 8 characters").max(72).nullish(),
  })
  .superRefine((input, context) => {
    input.lines.forEach((line, index) => {
      const named = `line ${index + 1}`;
      if (line.count == null && line.volume == null) {
        context.addIssue({ code: "custom", path: ["lines", index, "count"], message: `${named}: give how many, the volume, or both` });
      }
      if (line.count != null && (!Number.isInteger(line.count) || line.count < 1 || line.count > 100_000)) {
        context.addIssue({ code: "custom", path: ["lines", index, "count"], message: `${named}: the count is a whole number from 1 to 100000` });
      }
      if (line.volume != null) {
        const litres = litresFrom(line.volume.value, line.volume.unit);
        if (!(line.volume.value > 0)) {
          context.addIssue({ code: "custom", path: ["lines", index, "volume", "value"], message: `${named}: the volume is more than 0` });
        } else if (litres > BASKET_LINE_MAX_LITRES) {
          const most = +litresTo(BASKET_LINE_MAX_LITRES, line.volume.unit).toPrecision(3);
          context.addIssue({ code: "custom", path: ["lines", index, "volume", "value"], message: `${named}: at most ${most} ${measureLabel(line.volume.unit)} (${BASKET_LINE_MAX_LITRES} L) in one line of a basket; log a larger load as several baskets` });
        }
      }
      if (!(BASKET_CATEGORIES as readonly string[]).includes(line.category)) {
        context.addIssue({ code: "custom", path: ["lines", index, "category"], message: "a cultural find or human remains is logged on its own (Log a find): it places a stop-work hold and needs its own photos and custody" });
      }
      if (line.category !== "faunal" && (line.taxon || line.element)) {
        context.addIssue({ code: "custom", path: ["lines", index, "taxon"], message: "taxon and element are for faunal finds" });
      }
    });
  });
export type BasketLoadInput = z.input<typeof basketLoadInputSchema>;

export const custodyInputSchema = z.object({
  fromName: requiredText("name of who hands it over"),
  toName: requiredText("name of who receives it"),
  place: requiredText("place it goes to", 200),
  purpose: z.enum(CUSTODY_PURPOSES, { message: `the purpose is one of ${CUSTODY_PURPOSES.join(", ")}` }),
  handedAt: z.iso.datetime({ offset: true, message: "handedAt is a date and time with its offset" }),
  receiverSignature: requiredText("receiver's name, typed as their signature"),
  note: optionalText(2000),
});
export type CustodyInput = z.input<typeof custodyInputSchema>;

export const sightingInputSchema = z
  .object({
    species: z.string().trim().min(1, "name the species").max(120),
    seenAt: z.iso.datetime({ offset: true, message: "give the time as an ISO 8601 date-time with its offset, e.g. 2031-05-06T09:30:00-04:00" }),
    /** From the work, project length unit; may be left out when the animal is gone. */
    distance: z.number().finite().min(0, "the distance is 0 or more").max(100_000).nullish(),
    /** The animal has left (out of sight). */
    gone: z.boolean().default(false),
    position: z.object({ x: z.number().finite(), y: z.number().finite() }).nullish(),
    observer: z.string().trim().min(1, "name the observer").max(120),
    note: z.string().max(4000).nullish(),
    idempotencyKey: z.string().trim().min(1).max(64).nullish(),
  })
  .refine((input) => input.gone || input.distance != null, { path: ["distance"], message: "give the distance from the work, or say the animal is gone" });

export const tubeStatusSchema = z.object({ status: z.enum(TUBE_STATUSES, { message: `a tube's status is one of ${TUBE_STATUSES.join(", ")}` }) });

export const fillInputSchema = z.object({
  date: workDateSchema,
  /** Slurry pumped into the tube, when metered. */
  slurryVolume: z.object({ value: z.number().finite().positive("the slurry volume is more than 0").max(1e8), unit: z.enum(["gal", "m3"], { message: "the volume unit is gal or m3" }) }).nullish(),
  /** Estimated dry solids, project bulk mass unit (short tons or tonnes). */
  drySolids: z.number().finite().positive("the dry solids are more than 0").max(100_000),
});

// ——— Finds' status.

export const statusInputSchema = z
  .object({
    status: z.enum(FIND_STATUSES, { message: `the status is one of ${FIND_STATUSES.join(", ")}` }),
    accessionNumber: optionalText(60),
    note: optionalText(2000),
  })
  .superRefine((input, context) => {
    if (input.status === "curated" && !input.accessionNumber) context.addIssue({ code: "custom", path: ["accessionNumber"], message: "a curated find carries the lab's accession number" });
    if (input.status === "released" && !input.note) context.addIssue({ code: "custom", path: ["note"], message: "say why the find was released and where it went" });
  });

// ——— Dewatering: the shift log, jar tests, haul tickets.

export const clockSchema = z.string().trim().regex(/^([01]\d|2[0-3]):[0-5]\d$/, "a time is written HH:MM (24-hour clock)");
const text = (max: number) => z.string().trim().max(max);
const idempotencyKey = z.string().trim().min(8, "an idempotency key has at least 8 characters").max(80).nullish();

export const solidsSpecificGravitySchema = z.number().finite().gt(1, "solids are heavier than water: a specific gravity above 1").max(3.5, "a solids specific gravity above 3.5 is not sediment");

export const shiftInputSchema = z
  .object({
    date: workDateSchema,
    start: clockSchema,
    end: clockSchema,
    /** Hours the slurry pump ran; the whole shift when not given. */
    pumpHours: z.number().finite().positive("pump hours are more than 0").max(24).nullish(),
    slurryFlow: z.object({
      value: z.number().finite().positive("the slurry flow is more than 0").max(1_000_000),
      unit: z.enum(flowUnitSchema.options, { message: "the flow unit is gpm or m3/h" }),
    }).nullish(),
    /** Instead of the flow: the flow meter's totaliser at the start and end of the shift. */
    totaliser: z.object({
      start: z.number().finite().min(0, "a totaliser reading is 0 or more"),
      end: z.number().finite().min(0, "a totaliser reading is 0 or more"),
      unit: z.enum(["gal", "m3"], { message: "the totaliser unit is gal or m3" }),
    }).nullish(),
    solidsByWeight: z.number().finite().gt(0, "solids by weight is a share above 0").max(1, "solids by weight is a share of 0 to 1 (0.20 for 20 %)").nullish(),
    slurrySpecificGravity: z.number().finite().gt(1, "a slurry's specific gravity is above water's, 1").max(3).nullish(),
    /** The project's setting when not given. */
    solidsSpecificGravity: solidsSpecificGravitySchema.nullish(),
    polymer: z
      .object({
        product: text(120).min(1, "name the polymer product"),
        lot: text(60).nullish(),
        doseMgPerL: z.number().finite().positive("the dose is more than 0 mg/L").max(10_000),
        stockPercent: z.number().finite().positive("the stock concentration is more than 0 %").max(100, "a stock concentration is at most 100 %"),
      })
      .nullish(),
    tubes: z.array(text(60).min(1)).max(50).default([]),
    notes: z.string().max(4000).default(""),
    idempotencyKey,
  })
  .superRefine((input, context) => {
    const span = minutesOf(input.end) - minutesOf(input.start);
    if (span <= 0) {
      context.addIssue({ code: "custom", path: ["end"], message: "the shift ends after it starts (log a shift past midnight as two)" });
      return;
    }
    if ((input.slurryFlow == null) === (input.totaliser == null)) {
      context.addIssue({ code: "custom", path: ["slurryFlow"], message: "give the slurry flow, or the totaliser readings at the start and end (one of the two)" });
    }
    if (input.totaliser && input.totaliser.end <= input.totaliser.start) {
      context.addIssue({ code: "custom", path: ["totaliser", "end"], message: "the totaliser reads more at the end of the shift than at its start" });
    }
    if (input.pumpHours != null && input.pumpHours > span / 60 + 1e-9) {
      context.addIssue({ code: "custom", path: ["pumpHours"], message: `the pump ran at most the shift's ${Math.round((span / 60) * 100) / 100} hours` });
    }
    if (input.solidsByWeight != null && input.slurrySpecificGravity != null) {
      context.addIssue({ code: "custom", path: ["slurrySpecificGravity"], message: "give solids by weight or the slurry's specific gravity, not both" });
    }
    if (input.slurrySpecificGravity != null && input.solidsSpecificGravity != null && input.slurrySpecificGravity >= input.solidsSpecificGravity) {
      context.addIssue({ code: "custom", path: ["slurrySpecificGravity"], message: "a slurry is lighter than its solids: its specific gravity is below the solids'" });
    }
  });
const jarNtu = z.number().finite().min(0, "a turbidity is 0 NTU or more").max(100_000, "a turbidity above 100,000 NTU is not a reading");

export const jarInputSchema = z.object({
  doseMgPerL: z.number().finite().positive("the dose tried is more than 0 mg/L").max(10_000, "a dose above 10,000 mg/L is not a polymer dose"),
  settlingMinutes: z.number().finite().positive("the settling time is more than 0 minutes").max(1440, "a settling time is at most 1,440 minutes (a day)"),
  turbidityNtu: jarNtu.nullish(),
  clarity: z.enum(JAR_CLARITIES, { message: `the clarity is one of ${JAR_CLARITIES.join(", ")}` }),
});

export const jarTestInputSchema = z.object({
  date: workDateSchema,
  time: clockSchema.nullish(),
  /** Where the raw sample was drawn (the main line at the manifold, a tube's inlet…). */
  sampleSource: text(200).default(""),
  polymer: z.object({
    product: text(120).min(1, "name the polymer product"),
    lot: text(60).nullish(),
    /** The dilute stock made up for the bench, % weight per volume (0.1 % = 1 g/L). */
    benchStockPercent: z.number().finite().positive("the bench stock concentration is more than 0 %").max(10, "a bench stock above 10 % is not a dilute stock"),
  }),
  jarVolumeMl: z.number().finite().min(100, "a jar holds at least 100 mL").max(4000, "a jar holds at most 4,000 mL").default(DEFAULT_JAR_VOLUME_ML),
  raw: z.object({ turbidityNtu: jarNtu.nullish() }).nullish(),
  jars: z.array(jarInputSchema, { message: "give the dosed jars as a list" }).min(1, "give at least one dosed jar").max(8, "at most 8 dosed jars in one test"),
  chosenDoseMgPerL: z.number().finite().positive("the dose chosen is more than 0 mg/L").max(10_000, "a dose above 10,000 mg/L is not a polymer dose").nullish(),
  notes: z.string().max(4000).default(""),
  idempotencyKey: z.string().trim().min(8, "an idempotency key has at least 8 characters").max(80).nullish(),
});
/** The load as the ticket gives it: a scale's wet mass or the truck body's volume. */
export const LOAD_UNITS = ["short-ton", "t", "yd3", "m3"] as const;

export const haulInputSchema = z.object({
  date: workDateSchema,
  ticketNumber: text(60).min(1, "give the ticket number"),
  truck: text(60).min(1, "name the truck"),
  /** The site's name or id. */
  site: z.union([text(120).min(1, "choose the destination"), z.number().int().positive()]),
  load: z.object({
    value: z.number().finite().positive("the load is more than 0").max(200, "a truck load over 200 is not one truck"),
    unit: z.enum(LOAD_UNITS, { message: "the load is in short-ton or t (scale ticket), or yd3 or m3 (truck body)" }),
  }),
  /** Cake solids by weight of this load, 0–1, from a sample; the project default when not given. */
  cakeSolidsByWeight: z.number().finite().gt(0, "cake solids are a share above 0").max(1, "cake solids are a share of 0 to 1 (0.30 for 30 %)").nullish(),
  notes: z.string().max(4000).default(""),
  idempotencyKey: z.string().trim().min(8, "an idempotency key has at least 8 characters").max(80).nullish(),
});
