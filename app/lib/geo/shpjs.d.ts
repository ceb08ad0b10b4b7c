// shpjs ships no types: the one call Firmsand makes. A zip's bytes in; one layer's
// FeatureCollection, or one per layer when the zip holds several (each with its `fileName`).
declare module "shpjs" {
  type Layer = { type: "FeatureCollection"; features: Array<{ type: "Feature"; geometry: { type: string; coordinates: unknown } | null; properties: Record<string, unknown> }>; fileName?: string };
  export default function shp(zip: ArrayBuffer): Promise<Layer | Layer[]>;
}
