/**
 * The demo's finds: invented objects from the invented Wickerbill Spring run (no real site, object
 * or person), one of each category, with their handovers. `zone` and `cellRank` pick the cell (the
 * n-th cell of the zone, row by row), times are the project's local time (America/New_York).
 * The cultural find and the human remains place holds; both holds are lifted in the demo, with
 * who authorised resuming, so the demo's cells stay assignable.
 */

export interface DemoFind {
  key: string;
  category: "cultural" | "faunal" | "human-remains" | "historic-debris" | "modern-debris";
  description: string;
  material: string;
  count: number;
  taxon?: string;
  element?: string;
  condition: string;
  zone: "Vent basin" | "Upper run" | "Lower run";
  cellRank: number;
  depthBelowSurfaceFt: number;
  depthInMuckFt: number;
  finder: string;
  foundAtLocal: string;
  fieldTag: string;
  /** The colour of the generated stand-in photo (a flat card with a drawn scale bar). */
  photoColour: string;
  custody: Array<{ from: string; to: string; place: string; purpose: "to-site-store" | "to-state-lab" | "to-conservator" | "returned"; atLocal: string }>;
  status?: { status: "curated" | "released"; accessionNumber?: string; note?: string };
  /** For the finds that place a hold: when each agency was told, and the lift. */
  hold?: { toldAtLocal: string; liftedBy: string; note: string };
}

export const DEMO_FINDS: DemoFind[] = [
  {
    key: "point", category: "cultural", description: "Stemmed projectile point, tip missing, found in the intake screen basket", material: "chert", count: 1,
    condition: "tip broken (old break), edges sharp", zone: "Vent basin", cellRank: 40, depthBelowSurfaceFt: 14.2, depthInMuckFt: 1.1,
    finder: "Odessa Marchetti", foundAtLocal: "2026-11-10T09:12", fieldTag: "WB-T-014", photoColour: "#8a7f6a",
    custody: [
      { from: "Odessa Marchetti", to: "Ivo Brennagh", place: "Site store, locked cabinet 1", purpose: "to-site-store", atLocal: "2026-11-10T12:30" },
      { from: "Ivo Brennagh", to: "Marisol Quennell", place: "State archaeology lab, intake", purpose: "to-state-lab", atLocal: "2026-11-17T10:05" },
    ],
    status: { status: "curated", accessionNumber: "SAL-2026-0419" },
    hold: { toldAtLocal: "2026-11-10T11:40", liftedBy: "Dr. Marisol Quennell, state historic-preservation office (by e-mail)", note: "Area inspected on 2026-11-12; work may resume." },
  },
  {
    key: "antler", category: "faunal", description: "Antler tine, weathered, gnaw marks", material: "antler", count: 1, taxon: "white-tailed deer", element: "antler",
    condition: "dark stained, sound", zone: "Upper run", cellRank: 25, depthBelowSurfaceFt: 8.1, depthInMuckFt: 0.6,
    finder: "Juniper Adeyemi", foundAtLocal: "2026-11-10T10:48", fieldTag: "WB-T-015", photoColour: "#6f5a3e",
    custody: [{ from: "Juniper Adeyemi", to: "Ivo Brennagh", place: "Site store, shelf B", purpose: "to-site-store", atLocal: "2026-11-10T15:00" }],
    status: { status: "released", note: "Not kept by the lab; returned to the spring run bank under the permit's wildlife note." },
  },
  {
    key: "bone", category: "human-remains", description: "Small fragment of long bone, possibly human; left in place, area secured", material: "bone", count: 1,
    condition: "fragmentary", zone: "Lower run", cellRank: 30, depthBelowSurfaceFt: 8.4, depthInMuckFt: 1.8,
    finder: "Florian Bexley", foundAtLocal: "2026-11-12T11:20", fieldTag: "WB-T-016", photoColour: "#b8ad95",
    custody: [{ from: "Florian Bexley", to: "Dr. Teodor Vallance", place: "Medical examiner's office", purpose: "to-state-lab", atLocal: "2026-11-13T09:30" }],
    hold: { toldAtLocal: "2026-11-12T11:55", liftedBy: "Dr. Teodor Vallance, medical examiner, with the state archaeologist", note: "Examined: not human (deer femur fragment). Work may resume." },
  },
  {
    key: "bottle", category: "historic-debris", description: "Aqua glass bottle, embossed base, cork in place", material: "glass", count: 1,
    condition: "intact", zone: "Upper run", cellRank: 60, depthBelowSurfaceFt: 7.6, depthInMuckFt: 0.3,
    finder: "Juniper Adeyemi", foundAtLocal: "2026-11-10T14:02", fieldTag: "WB-T-017", photoColour: "#5f9e97",
    custody: [],
  },
  {
    key: "cans", category: "modern-debris", description: "Aluminium cans and a fishing lure", material: "aluminium, plastic", count: 7,
    condition: "crushed", zone: "Lower run", cellRank: 10, depthBelowSurfaceFt: 7.9, depthInMuckFt: 0.1,
    finder: "Florian Bexley", foundAtLocal: "2026-11-12T13:45", fieldTag: "WB-T-018", photoColour: "#9aa3a8",
    custody: [],
  },
];

/**
 * The demo's basket loads: what invented divers' baskets brought up on the demo dives (named by
 * the dive's date and diver), a line per kind with its count, its volume as measured, or both.
 * Invented numbers; times are the project's local time.
 */
export interface DemoBasket {
  diveDate: string;
  diver: string;
  broughtUpAtLocal: string;
  fieldTag: string;
  depthBelowSurfaceFt: number;
  lines: Array<{
    category: "faunal" | "historic-debris" | "modern-debris";
    description: string;
    material?: string;
    count?: number;
    volume?: { value: number; unit: "gal" | "ft3" };
    taxon?: string;
    element?: string;
  }>;
}

export const DEMO_BASKETS: DemoBasket[] = [
  {
    diveDate: "2026-11-10", diver: "Odessa Marchetti", broughtUpAtLocal: "2026-11-10T09:30", fieldTag: "WB-B-001", depthBelowSurfaceFt: 7.9,
    lines: [
      { category: "modern-debris", description: "Drink cans, crushed", material: "aluminium", count: 11, volume: { value: 1.5, unit: "gal" } },
      { category: "modern-debris", description: "Fishing line, tangled in a ball", material: "nylon monofilament", volume: { value: 0.25, unit: "gal" } },
      { category: "historic-debris", description: "Bottle glass fragments, aqua", material: "glass", count: 7 },
    ],
  },
  {
    diveDate: "2026-11-10", diver: "Juniper Adeyemi", broughtUpAtLocal: "2026-11-10T11:25", fieldTag: "WB-B-002", depthBelowSurfaceFt: 8.3,
    lines: [
      { category: "historic-debris", description: "Brick and mortar fragments", material: "fired clay", count: 5, volume: { value: 0.4, unit: "ft3" } },
      { category: "faunal", description: "Snail shells, empty", count: 23, taxon: "apple snail", element: "shell" },
    ],
  },
  {
    diveDate: "2026-11-12", diver: "Florian Bexley", broughtUpAtLocal: "2026-11-12T11:40", fieldTag: "WB-B-003", depthBelowSurfaceFt: 8.1,
    lines: [
      { category: "modern-debris", description: "Rope scraps and a torn tarpaulin", material: "polypropylene", volume: { value: 3, unit: "gal" } },
      { category: "modern-debris", description: "Lead sinkers", material: "lead", count: 4 },
    ],
  },
];
