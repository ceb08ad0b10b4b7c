/**
 * The colours a manager gives the project's zones. They are drawn as zone outlines (over a white
 * casing, so they read on every cell colour) and as zone names in the same colour on a white halo,
 * over the map's land and water. Chosen here so that each reads as text on white (WCAG 2.x contrast
 * at least 4.5:1), each outline stands out from the land and water (at least 3:1), and every pair,
 * and each against the work limit's red, stays apart under colour-vision deficiency simulation
 * (checked in zone-colours.test.ts). The zone's name is always written beside its colour, so the
 * colour is never the only way to tell zones apart. The order is the order of the defaults: the
 * first zones get the colours furthest apart.
 */
export const ZONE_COLOURS = [
  { value: "#0d5c66", name: "Teal" },
  { value: "#aa6600", name: "Ochre" },
  { value: "#552288", name: "Violet" },
  { value: "#777755", name: "Olive" },
  { value: "#770022", name: "Wine" },
  { value: "#9955aa", name: "Orchid" },
  { value: "#333366", name: "Slate" },
  { value: "#3366cc", name: "Blue" },
] as const;

export type ZoneColour = (typeof ZONE_COLOURS)[number]["value"];

export const ZONE_COLOUR_VALUES = ZONE_COLOURS.map((colour) => colour.value) as [ZoneColour, ...ZoneColour[]];

export function isZoneColour(value: string): value is ZoneColour {
  return (ZONE_COLOUR_VALUES as readonly string[]).includes(value);
}

/** The colour's name in words ("Teal"), for labels and the audit log; the value itself when it is not one of ours. */
export function zoneColourName(value: string): string {
  return ZONE_COLOURS.find((colour) => colour.value === value)?.name ?? value;
}

/**
 * The colour a zone gets when none is chosen: the first of the palette that no other zone of the
 * project has, in the palette's order; once all are taken, they go round again by the zone's place.
 */
export function defaultZoneColour(taken: readonly string[], index: number): ZoneColour {
  return ZONE_COLOUR_VALUES.find((colour) => !taken.includes(colour)) ?? ZONE_COLOUR_VALUES[index % ZONE_COLOUR_VALUES.length];
}
