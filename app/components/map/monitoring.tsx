import type { FeatureCollection, Point } from "geojson";
import type { StationKind } from "../../../shared/water-quality/wording";
import { dateTimeFormat } from "../../../shared/local-time";
import type { LegendSection } from "./legend";

/**
 * The map's water-quality and wildlife layer: monitoring stations by kind, and the wildlife
 * sightings of the last hours chosen in the panel, each with its species and time. Built from what
 * the page's loader sends (lon/lat already); the style holds empty sources that this fills.
 */

/** How far back the loader reads sightings; the panel shows up to this many hours. */
export const SIGHTINGS_READ_HOURS = 72;
/** The hours of sightings the panel offers; 24 by default. */
export const SIGHTING_HOURS_CHOICES = [6, 24, 72] as const;
export type SightingHours = (typeof SIGHTING_HOURS_CHOICES)[number];

export interface MapStation {
  id: number;
  name: string;
  kind: StationKind;
  depth: "surface" | "mid-depth" | "near-bottom" | null;
  lonLat: [number, number] | null;
  /** `takenClock`: when, as the crew reads it (clockOf, in the project's time zone), written where the record is read. */
  latest: { value: number; unit: string; takenAt: string; takenClock: string; exceeds: boolean | null } | null;
}

export interface MapSighting {
  id: number;
  species: string;
  seenAt: string;
  /**
   * When it was seen, as the crew reads it (clockOf, in the project's time zone), written where the
   * record is read: the page's first formatter with a time zone costs it tens of ms while it starts.
   */
  seenClock: string;
  /** Project length unit; null when the animal was out of sight. */
  distance: number | null;
  gone: boolean;
  observer: string;
  note: string;
  lonLat: [number, number] | null;
  /** The stand-down this sighting belongs to is still in force. */
  standDownInForce: boolean;
}

export interface MapMonitoring {
  /** The server's clock when read: "the last N hours" counts back from it. */
  nowMs: number;
  stations: MapStation[];
  sightings: MapSighting[];
}

/** One point on the layer: "station:3" or "sighting:12". */
export type MonitoringKey = `station:${number}` | `sighting:${number}`;

export const STATION_KIND_LABELS: Record<StationKind, string> = { background: "Background", compliance: "Compliance point", outfall: "Return outfall", other: "Other station" };
export const STATION_COLOURS: Record<StationKind, string> = { background: "#2d6fa3", compliance: "#6b2f8f", outfall: "#11806a", other: "#596267" };
export const SIGHTING_COLOURS = { seen: "#e07b00", standDown: "#b3261e" } as const;
const DEPTH_LABELS = { surface: "surface", "mid-depth": "mid-depth", "near-bottom": "near bottom" } as const;

/** The style's layers of this group (coverage-map.tsx toggles them together). */
export const MONITORING_LAYERS = ["sightings-points", "sightings-labels", "stations-points", "stations-labels", "stations-chosen", "sightings-chosen"];
/** The layers a click picks a station or sighting from. */
export const MONITORING_CLICK_LAYERS = ["stations-points", "sightings-points"];

export function recentSightings(monitoring: MapMonitoring, hours: number): MapSighting[] {
  const since = monitoring.nowMs - hours * 3_600_000;
  return monitoring.sightings.filter((sighting) => Date.parse(sighting.seenAt) >= since);
}

/** Local clock time and day, as a crew reads it, in the project's time zone. */
export function clockOf(iso: string, timeZone: string): string {
  return dateTimeFormat("en-GB", { timeZone, day: "2-digit", month: "short", hour: "2-digit", minute: "2-digit", hour12: false }).format(new Date(iso));
}

export function stationFeatures(stations: readonly MapStation[]): FeatureCollection<Point> {
  return {
    type: "FeatureCollection",
    features: stations.filter((station) => station.lonLat).map((station) => ({
      type: "Feature", id: station.id,
      properties: { key: `station:${station.id}`, name: station.name, colour: STATION_COLOURS[station.kind] },
      geometry: { type: "Point", coordinates: station.lonLat! },
    })),
  };
}

export function sightingFeatures(sightings: readonly MapSighting[]): FeatureCollection<Point> {
  return {
    type: "FeatureCollection",
    features: sightings.filter((sighting) => sighting.lonLat).map((sighting) => ({
      type: "Feature", id: sighting.id,
      properties: {
        key: `sighting:${sighting.id}`, label: `${sighting.species} ${sighting.seenClock}`,
        colour: sighting.standDownInForce ? SIGHTING_COLOURS.standDown : SIGHTING_COLOURS.seen,
      },
      geometry: { type: "Point", coordinates: sighting.lonLat! },
    })),
  };
}

/** The legend's sections for this layer: the station kinds present, and the sightings shown. */
export function monitoringLegend(monitoring: MapMonitoring, sightings: readonly MapSighting[], hours: number): LegendSection[] {
  const sections: LegendSection[] = [];
  if (monitoring.stations.length > 0) {
    const unplaced = monitoring.stations.filter((station) => !station.lonLat).length;
    const kinds = [...new Set(monitoring.stations.map((station) => station.kind))];
    sections.push({
      title: "Monitoring stations",
      note: unplaced > 0 ? `${unplaced} without a position: listed in the panel only.` : undefined,
      entries: kinds.map((kind) => ({ colour: STATION_COLOURS[kind], label: `${STATION_KIND_LABELS[kind]} (${monitoring.stations.filter((station) => station.kind === kind).length})` })),
    });
  }
  const unplaced = sightings.filter((sighting) => !sighting.lonLat).length;
  const inForce = sightings.filter((sighting) => sighting.standDownInForce).length;
  sections.push({
    title: `Wildlife sightings, last ${hours} h`,
    note: sightings.length === 0 ? "None recorded in that time." : unplaced > 0 ? `${unplaced} without a position: listed in the panel only.` : "Labelled with species and local time.",
    entries: sightings.length === 0 ? [] : [
      { colour: SIGHTING_COLOURS.seen, label: `Sighting (${sightings.length - inForce})` },
      { colour: SIGHTING_COLOURS.standDown, label: `Its stand-down still in force (${inForce})` },
    ],
  });
  return sections;
}

/** The chosen station or sighting, in words. */
function MonitoringDetail({ item, lengthUnit }: { item: { station: MapStation } | { sighting: MapSighting }; lengthUnit: string }) {
  if ("station" in item) {
    const { station } = item;
    return (
      <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1" data-testid="monitoring-detail">
        <dt className="text-muted">Station</dt><dd className="font-semibold">{station.name}</dd>
        <dt className="text-muted">Kind</dt><dd>{STATION_KIND_LABELS[station.kind]}</dd>
        <dt className="text-muted">Depth</dt><dd>{station.depth ? DEPTH_LABELS[station.depth] : "not set"}</dd>
        <dt className="text-muted">Latest</dt>
        <dd>
          {station.latest ? (
            <>
              <span className="figures">{station.latest.value} {station.latest.unit}</span> at <time className="figures whitespace-nowrap" dateTime={station.latest.takenAt}>{station.latest.takenClock}</time>
              {station.latest.exceeds === true ? <strong className="text-danger"> exceeded the limit</strong> : station.latest.exceeds === false ? " within the limit" : ""}
            </>
          ) : "no reading yet"}
        </dd>
        {station.lonLat ? null : <><dt className="text-muted">Position</dt><dd>not set: not drawn</dd></>}
      </dl>
    );
  }
  const { sighting } = item;
  return (
    <dl className="grid grid-cols-[auto_1fr] gap-x-3 gap-y-1" data-testid="monitoring-detail">
      <dt className="text-muted">Sighting</dt><dd className="font-semibold">{sighting.species}</dd>
      <dt className="text-muted">Seen</dt><dd><time className="figures whitespace-nowrap" dateTime={sighting.seenAt}>{sighting.seenClock}</time></dd>
      <dt className="text-muted">Distance</dt><dd>{sighting.gone ? "gone (left the area)" : sighting.distance !== null ? <span className="figures">{sighting.distance} {lengthUnit}</span> : "not given"}</dd>
      <dt className="text-muted">Observer</dt><dd>{sighting.observer}</dd>
      <dt className="text-muted">Stand-down</dt><dd>{sighting.standDownInForce ? <strong className="text-danger">in force: no in-water work</strong> : "none in force"}</dd>
      {sighting.note ? <><dt className="text-muted">Note</dt><dd>{sighting.note}</dd></> : null}
      {sighting.lonLat ? null : <><dt className="text-muted">Position</dt><dd>not given: not drawn</dd></>}
    </dl>
  );
}

/**
 * The panel's list of stations and recent sightings: each a button that shows it (and flies the
 * map to it when it has a position), so every point can be reached and read from the keyboard.
 */
export function MonitoringPanel({ monitoring, sightings, hours, onHours, chosen, onChoose, lengthUnit }: {
  monitoring: MapMonitoring;
  sightings: readonly MapSighting[];
  hours: SightingHours;
  onHours: (hours: SightingHours) => void;
  chosen: MonitoringKey | null;
  onChoose: (key: MonitoringKey) => void;
  lengthUnit: string;
}) {
  const chosenItem = chosen?.startsWith("station:")
    ? (() => { const station = monitoring.stations.find((candidate) => `station:${candidate.id}` === chosen); return station ? { station } : null; })()
    : (() => { const sighting = sightings.find((candidate) => `sighting:${candidate.id}` === chosen); return sighting ? { sighting } : null; })();
  const button = (key: MonitoringKey, colour: string, text: React.ReactNode) => (
    <li key={key}>
      <button type="button" aria-pressed={chosen === key} onClick={() => onChoose(key)} className={`flex w-full items-center gap-2 rounded px-1 py-0.5 text-left hover:bg-paper focus-visible:outline-2 focus-visible:outline-lagoon ${chosen === key ? "bg-paper font-semibold" : ""}`}>
        <span aria-hidden className="inline-block h-3 w-3 shrink-0 rounded-full border border-white" style={{ background: colour }} />
        <span className="min-w-0">{text}</span>
      </button>
    </li>
  );
  return (
    <section aria-labelledby="monitoring-title" className="space-y-2 rounded border border-line p-3 text-sm" data-testid="monitoring-panel">
      <h3 id="monitoring-title" className="font-semibold">Stations and sightings</h3>
      {chosenItem ? <MonitoringDetail item={chosenItem} lengthUnit={lengthUnit} /> : <p className="text-muted">Choose a station or sighting (or click its point, or press W on the map) to read it here.</p>}
      {monitoring.stations.length === 0 ? <p className="text-muted">No monitoring stations yet: the manager adds them on the water-quality setup page.</p> : (
        <ul aria-label="Monitoring stations" className="space-y-0.5">
          {monitoring.stations.map((station) => button(`station:${station.id}`, STATION_COLOURS[station.kind], <>{station.name} <span className="text-muted">· {STATION_KIND_LABELS[station.kind].toLowerCase()}{station.lonLat ? "" : " · no position"}</span></>))}
        </ul>
      )}
      <label className="block">Sightings from the last
        <select aria-label="Sightings from the last" value={hours} onChange={(event) => onHours(Number(event.target.value) as SightingHours)} className="ml-2 rounded border border-line px-1 py-1">
          {SIGHTING_HOURS_CHOICES.map((choice) => <option key={choice} value={choice}>{choice} hours</option>)}
        </select>
      </label>
      {sightings.length === 0 ? <p className="text-muted">No wildlife sightings in the last {hours} hours.</p> : (
        <ul aria-label="Wildlife sightings" className="space-y-0.5">
          {sightings.map((sighting) => button(
            `sighting:${sighting.id}`,
            sighting.standDownInForce ? SIGHTING_COLOURS.standDown : SIGHTING_COLOURS.seen,
            <>{sighting.species} <time className="figures whitespace-nowrap text-muted" dateTime={sighting.seenAt}>{sighting.seenClock}</time>{sighting.lonLat ? "" : <span className="text-muted"> · no position</span>}</>,
          ))}
        </ul>
      )}
    </section>
  );
}

/** The located points in the order W steps through them: stations, then sightings newest first. */
export function locatedKeys(monitoring: MapMonitoring, sightings: readonly MapSighting[]): Array<{ key: MonitoringKey; lonLat: [number, number]; name: string }> {
  return [
    ...monitoring.stations.filter((station) => station.lonLat).map((station) => ({ key: `station:${station.id}` as MonitoringKey, lonLat: station.lonLat!, name: `${STATION_KIND_LABELS[station.kind]} station ${station.name}` })),
    ...sightings.filter((sighting) => sighting.lonLat).map((sighting) => ({ key: `sighting:${sighting.id}` as MonitoringKey, lonLat: sighting.lonLat!, name: `${sighting.species} sighting` })),
  ];
}

export function lonLatOfKey(monitoring: MapMonitoring, key: MonitoringKey): [number, number] | null {
  const [kind, id] = key.split(":");
  const item = kind === "station" ? monitoring.stations.find((station) => station.id === Number(id)) : monitoring.sightings.find((sighting) => sighting.id === Number(id));
  return item?.lonLat ?? null;
}
