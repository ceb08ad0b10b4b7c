import type { FeatureCollection } from "geojson";
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { data, Link, useLocation } from "react-router";
import { createCrs } from "../../shared/crs";
import { CELL_STATUSES } from "../../shared/cell-status";
import { AssignPanel } from "~/components/map/assign-panel";
import { ZoneFromCells } from "~/components/map/zone-from-cells";
import { CellInspector } from "~/components/map/cell-inspector";
import { cellCentreLonLat, labelIndex, type CellsData } from "~/components/map/cell-features";
import { cellIndexAtLonLat } from "~/components/map/cell-image";
import { workLimitExtent, type LonLatWorkLimit } from "~/components/map/clip-cells";
import { CoverageMap } from "~/components/map/coverage-map";
import { startMapPageReads, takeEarlyRead } from "~/components/map/early-reads";
import { mapCellsUrl } from "~/components/map/map-urls";
import { MapLegend, type LegendSection } from "~/components/map/legend";
import { MapKeysHelp } from "~/components/map/map-keys";
import { MapPanel } from "~/components/map/map-panel";
import { NorthArrow } from "~/components/map/north-arrow";
import { MARK_STYLES, MARK_SWATCHES, TUBE_COLOURS, bandLegend, legendFor, type BandBounds, type MapView } from "~/components/map/paint";
import { MapSettings } from "~/components/map/map-settings";
import { MonitoringPanel, locatedKeys, lonLatOfKey, monitoringLegend, recentSightings, sightingFeatures, stationFeatures, type MonitoringKey, type SightingHours } from "~/components/map/monitoring";
import { LAYER_KEYS, mapViewSearch, type LayerKey } from "~/components/map/view-url";
import { parseMapView } from "~/components/map/view-url.server";
import { can } from "~/lib/auth/permissions";
import { requireRole } from "~/lib/auth/access.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { fileTooLargeMessage } from "~/lib/http/upload-size.server";
import { readFileForm } from "~/lib/http/body.server";
import { DomainError } from "~/lib/errors";
import { listDiveTeams } from "~/models/assignments.server";
import { heldCellLabelsFor } from "~/models/holds.server";
import { listSurveys } from "~/models/survey.server";
import { findProject } from "~/lib/auth/project-view.server";
import { SHORELINE_MAX_BYTES } from "~/models/shoreline-geojson";
import { getShoreline, removeShoreline, saveShoreline } from "~/models/shoreline.server";
import { currentStoppagesFor, workStoppedMessage } from "~/models/stoppages.server";
import { listTubes } from "~/models/dewatering.server";
import { listZones } from "~/models/project.server";
import { mapMonitoring } from "~/models/map-monitoring.server";
import { describeEquipment } from "../../shared/dive-plan/equipment";
import type { Route } from "./+types/projects.$projectId.map";

// On a first visit to this page, its style and cells are read while the page hydrates.
startMapPageReads();

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId);
  const { project } = access;
  // Held cells for those who read finds (outreach sees nothing of finds): "held", no details.
  const canReadFinds = can(access, "finds.read");
  const [teams, shoreline, row, surveys, stoppages, heldCells, register, monitoring, zones] = await Promise.all([
    listDiveTeams(project), getShoreline(project), findProject(project.id), listSurveys(project), currentStoppagesFor(request, project), canReadFinds ? heldCellLabelsFor(request, project.id) : Promise.resolve([]),
    listTubes(project), mapMonitoring(project), listZones(project),
  ]);
  // The tubes the style draws (placed on the laydown area, not yet hauled), for the legend.
  const drawnTubes = register.tubes.filter((tube) => tube.position !== null && tube.status !== "hauled");
  return {
    projectId: project.id,
    hasWorkLimit: project.hasWorkLimit,
    lengthUnit: project.lengthUnit,
    crsCode: project.crs,
    minTeamSize: project.minTeamSize,
    canAssign: can(access, "plans.assign"),
    workStopped: workStoppedMessage(stoppages),
    // A new project's empty grid says what comes next.
    hasSurveys: surveys.length > 0,
    canImport: can(access, "surveys.import"),
    canConfigure: can(access, "map.configure"),
    // Zones are the project's settings: a zone made of selected cells is for those who configure it.
    canMakeZones: can(access, "project.configure"),
    shoreline,
    shorelineMaxBytes: SHORELINE_MAX_BYTES,
    // Lon/lat, as stored: the browser clips the cells along it.
    workLimit: row?.workLimitGeoJson ? (JSON.parse(row.workLimitGeoJson) as LonLatWorkLimit) : null,
    heldCells,
    monitoring,
    // The zones as the style draws them (outline and name in the zone's colour), for the legend.
    zones: zones.map((zone) => ({ id: zone.id, name: zone.name, colour: zone.colour })),
    tubes: { count: drawnTubes.length, nearCapacity: drawnTubes.filter((tube) => tube.nearCapacity).length, nearCapacityShare: register.nearCapacityShare },
    // The view sent in the address (centre, zoom, layers, zone, cells): the page opens on it.
    initialView: parseMapView(new URL(request.url).searchParams),
    teams: teams.map((team) => ({ id: team.id, name: team.name, hoses: team.hoses.map((hose) => ({ name: hose.name, label: describeEquipment(hose) })), size: team.members.length, belowMinimum: team.belowMinimum })),
  };
}

export type MapSettingsResult = { intent: "upload" | "remove"; ok: boolean; message: string };

// A refused settings change answers 4xx with the reason; the settings panel shows it.
const refused = (message: string, status = 400) => data<MapSettingsResult>({ intent: "upload", ok: false, message }, { status });

// POST /projects/<id>/map — the manager's map settings: upload, replace or remove the shoreline.
export async function action({ request, params }: Route.ActionArgs) {
  const { user, project } = await requireRole(request, params.projectId, "map.configure");
  const tooLarge = fileTooLargeMessage(SHORELINE_MAX_BYTES, "simplify the shoreline first");
  const form = await readFileForm(request, SHORELINE_MAX_BYTES);
  if (!form) return refused(tooLarge, 413);
  const intent = form.get("intent");
  if (intent === "remove") {
    const removed = await removeShoreline(project, user, clientAddress(request));
    return { intent: "remove", ok: removed, message: removed ? "Shoreline removed; the map's water now follows the work limit alone." : "There was no shoreline to remove." } satisfies MapSettingsResult;
  }
  if (intent !== "upload") return refused("Unknown request.");
  const file = form.get("shoreline");
  if (!(file instanceof File) || file.size === 0) return refused("Choose a GeoJSON file to upload.");
  if (file.size > SHORELINE_MAX_BYTES) return refused(tooLarge, 413);
  try {
    const saved = await saveShoreline(project, user, file.name, await file.text(), clientAddress(request));
    const what = `${saved.fileName} (${saved.polygons} polygon${saved.polygons === 1 ? "" : "s"}, ${saved.vertices.toLocaleString("en-US")} vertices)`;
    return { intent: "upload", ok: true, message: saved.replaced ? `Shoreline replaced by ${what}.` : `Shoreline ${what} uploaded.` } satisfies MapSettingsResult;
  } catch (error) {
    if (error instanceof DomainError) return refused(error.message);
    throw error;
  }
}

// The map fills the window (the project layout reads this).
export const handle = { workspace: true };

export function meta() {
  return [{ title: "Coverage map · Firmsand" }];
}

/** How often a visible map asks whether the cells changed (a 304 when they did not). */
const POLL_MS = 30_000;

const VIEW_TITLES: Record<MapView, string> = { status: "Cell status", thickness: "Remaining sediment thickness", removed: "Removed volume per cell" };
const LAYER_NAMES: Record<LayerKey, string> = { cells: "Cells", bands: "Bands", zones: "Zones", workLimit: "Work limit", shoreline: "Shoreline", labels: "Labels", monitoring: "Stations and sightings", tubes: "Geotextile tubes" };
const BAND_TITLES = { remaining: "Remaining thickness bands", depth: "Bottom depth bands" } as const;

const tomorrow = () => new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);

/** True while the user types in a field: the map's single-letter keys stay out of the way. */
function typing(target: EventTarget | null): boolean {
  return target instanceof HTMLElement && (target.isContentEditable || ["INPUT", "SELECT", "TEXTAREA"].includes(target.tagName));
}

export default function ProjectMap({ loaderData, actionData }: Route.ComponentProps) {
  const { projectId, initialView } = loaderData;
  const [data, setData] = useState<CellsData | null>(null);
  const [loadError, setLoadError] = useState<string | null>(null);
  const [view, setView] = useState<MapView>(initialView.view);
  const [layers, setLayers] = useState<Record<LayerKey, boolean>>(initialView.layers);
  const [bandSurface, setBandSurface] = useState<"remaining" | "depth">(initialView.bandSurface);
  const [bands, setBands] = useState<{ surface: "remaining" | "depth"; collection: FeatureCollection } | null>(null);
  const [zoneId, setZoneId] = useState<number | null>(initialView.zoneId);
  const [selected, setSelected] = useState<ReadonlySet<number>>(new Set());
  const [focus, setFocus] = useState<number | null>(null);
  const [assigned, setAssigned] = useState<ReadonlySet<number>>(new Set());
  const [planDate, setPlanDate] = useState(() => initialView.planDate ?? tomorrow());
  const [pointer, setPointer] = useState<[number, number] | null>(null);
  const [bearing, setBearing] = useState(0);
  const [flyTo, setFlyTo] = useState<{ lonLat: [number, number]; serial: number } | null>(null);
  const [cameraCommand, setCameraCommand] = useState<{ kind: "zoom-in" | "zoom-out" | "frame"; serial: number } | null>(null);
  const [camera, setCamera] = useState<{ centre: [number, number]; zoom: number } | null>(initialView.centre && initialView.zoom !== null ? { centre: initialView.centre, zoom: initialView.zoom } : null);
  const [search, setSearch] = useState("");
  const [searchMessage, setSearchMessage] = useState<string | null>(null);
  const [refresh, setRefresh] = useState(0);
  const [panelOpen, setPanelOpen] = useState<boolean | null>(null);
  const [wide, setWide] = useState<boolean | null>(null);
  const [announcement, setAnnouncement] = useState("");
  const [sightingHours, setSightingHours] = useState<SightingHours>(24);
  const [chosenPoint, setChosenPoint] = useState<MonitoringKey | null>(null);
  const monitoringRef = useRef<HTMLDivElement>(null);
  const { monitoring } = loaderData;
  const shownSightings = useMemo(() => recentSightings(monitoring, sightingHours), [monitoring, sightingHours]);
  const stationPoints = useMemo(() => stationFeatures(monitoring.stations), [monitoring]);
  const sightingPoints = useMemo(() => sightingFeatures(shownSightings), [shownSightings]);
  const monitoringShown = useMemo(() => ({ stations: stationPoints, sightings: sightingPoints, chosen: chosenPoint }), [stationPoints, sightingPoints, chosenPoint]);
  /** Shows a station or sighting in the panel and, when it has a position, flies the map to it. */
  const choosePoint = useCallback((key: MonitoringKey, fly: boolean) => {
    setChosenPoint(key);
    setPanelOpen(true);
    const lonLat = lonLatOfKey(monitoring, key);
    if (fly && lonLat) setFlyTo({ lonLat, serial: Date.now() });
  }, [monitoring]);
  const initialCamera = useRef(camera);
  const extent = useMemo(() => workLimitExtent(loaderData.workLimit), [loaderData.workLimit]);
  const searchInput = useRef<HTMLInputElement>(null);
  const inspectorRef = useRef<HTMLDivElement>(null);
  const assignRef = useRef<HTMLDivElement>(null);

  useEffect(() => {
    const query = window.matchMedia("(min-width: 1024px)");
    const update = () => setWide(query.matches);
    update();
    query.addEventListener("change", update);
    return () => query.removeEventListener("change", update);
  }, []);
  const panelShown = panelOpen ?? wide ?? true;
  const togglePanel = useCallback(() => setPanelOpen((current) => !(current ?? wide ?? true)), [wide]);

  // The cells' ETag is the project's cells version: a conditional re-read costs a 304 and no
  // redraw until an import, a retract or a settings change makes a new version.
  const cellsVersion = useRef<string | null>(null);
  const loadCells = useCallback(async () => {
    const headers: HeadersInit = cellsVersion.current ? { "If-None-Match": cellsVersion.current } : {};
    // The first read may have been started before the page was hydrated (early-reads.ts).
    const early = cellsVersion.current ? null : takeEarlyRead(mapCellsUrl(projectId));
    const response = await (early ?? fetch(mapCellsUrl(projectId), { headers, cache: "no-store" }));
    if (response.status === 304) return false;
    if (!response.ok) throw new Error(`the server answered ${response.status}`);
    const next = (await response.json()) as CellsData;
    cellsVersion.current = response.headers.get("ETag");
    setData(next);
    setLoadError(null);
    return true;
  }, [projectId]);

  useEffect(() => {
    loadCells().catch((error: Error) => setLoadError(error.message));
  }, [loadCells]);

  const labels = useMemo(() => (data ? labelIndex(data) : new Map<string, number>()), [data]);
  const labelOf = useMemo(() => new Map([...labels].map(([label, index]) => [index, label])), [labels]);
  const crs = useMemo(() => (data ? createCrs(data.crs.definition) : null), [data]);
  const held = useMemo(() => new Set(loaderData.heldCells.map((label) => labels.get(label)).filter((index): index is number => index !== undefined)), [loaderData.heldCells, labels]);
  const zoneIndex = useMemo(() => {
    if (zoneId === null || !data) return null;
    const index = data.zones.findIndex((zone) => zone.id === zoneId);
    return index < 0 ? null : index;
  }, [zoneId, data]);

  // The cells sent in the address are selected once the grid is known.
  const cellsFromAddress = useRef<string[] | null>(initialView.cells);
  useEffect(() => {
    const wanted = cellsFromAddress.current;
    if (!data || !wanted) return;
    cellsFromAddress.current = null;
    const indices = wanted.map((label) => labels.get(label)).filter((index): index is number => index !== undefined);
    if (indices.length === 0) return;
    setSelected(new Set(indices));
    setFocus(indices[indices.length - 1]);
  }, [data, labels]);

  const loadAssigned = useCallback(async (date: string) => {
    const response = await fetch(`/api/projects/${projectId}/assignments?date=${date}`);
    if (!response.ok) return;
    const plan = (await response.json()) as { teams: Array<{ cells: Array<{ label: string }> }> };
    setAssigned(new Set(plan.teams.flatMap((team) => team.cells.map((cell) => labels.get(cell.label)).filter((index): index is number => index !== undefined))));
  }, [projectId, labels]);

  useEffect(() => {
    if (data) loadAssigned(planDate).catch(() => undefined);
  }, [data, planDate, loadAssigned]);

  // Another person's import or plan shows up without a reload: when the page comes back into view
  // or regains focus, and every POLL_MS while it is visible.
  useEffect(() => {
    const refreshNow = () => {
      if (document.visibilityState !== "visible") return;
      loadCells().catch((error: Error) => setLoadError((current) => (data ? current : error.message)));
      loadAssigned(planDate).catch(() => undefined);
    };
    const timer = window.setInterval(refreshNow, POLL_MS);
    document.addEventListener("visibilitychange", refreshNow);
    window.addEventListener("focus", refreshNow);
    return () => {
      window.clearInterval(timer);
      document.removeEventListener("visibilitychange", refreshNow);
      window.removeEventListener("focus", refreshNow);
    };
  }, [loadCells, loadAssigned, planDate, data]);

  useEffect(() => {
    if (!layers.bands) return;
    let cancelled = false;
    fetch(`/api/projects/${projectId}/bands?surface=${bandSurface}`)
      .then((response) => response.json())
      .then((collection: FeatureCollection) => !cancelled && setBands({ surface: bandSurface, collection }))
      .catch(() => undefined);
    return () => {
      cancelled = true;
    };
  }, [projectId, layers.bands, bandSurface]);

  const selectedLabels = useMemo(() => [...selected].map((index) => labelOf.get(index)).filter((label): label is string => Boolean(label)).sort(), [selected, labelOf]);

  // The address holds the view (replaced, never pushed: Back leaves the map), so a supervisor can
  // send a link to it. Written only once the cells are known, so the sent cells are not lost; and
  // again after a form on the page is sent (the router then sets the address it knows, without the view).
  const { key: locationKey } = useLocation();
  useEffect(() => {
    if (!data) return;
    const searchPart = mapViewSearch({ centre: camera?.centre ?? null, zoom: camera?.zoom ?? null, view, layers, bandSurface, zoneId, cells: selectedLabels, planDate: planDate === tomorrow() ? null : planDate });
    const next = `${window.location.pathname}${searchPart}${window.location.hash}`;
    if (next !== `${window.location.pathname}${window.location.search}${window.location.hash}`) window.history.replaceState(window.history.state, "", next);
  }, [data, camera, view, layers, bandSurface, zoneId, selectedLabels, planDate, locationKey]);

  const selectOne = useCallback((index: number, extend: boolean) => {
    setSelected((current) => {
      if (!extend) return new Set([index]);
      const next = new Set(current);
      if (next.has(index)) next.delete(index);
      else next.add(index);
      return next;
    });
    setFocus(index);
  }, []);

  const onBoxSelect = useCallback((indices: number[]) => {
    setSelected((current) => new Set([...current, ...indices]));
    if (indices.length > 0) setFocus(indices[indices.length - 1]);
  }, []);

  /** The cell the keys start from: the current one, else the one under the map's centre, else the first. */
  function startCell(): number | null {
    if (!data?.grid) return null;
    if (focus !== null) return focus;
    if (camera) {
      const index = cellIndexAtLonLat(data, camera.centre[0], camera.centre[1]);
      if (index >= 0 && data.status[index] >= 0) return index;
    }
    const first = data.status.findIndex((code) => code >= 0);
    return first < 0 ? null : first;
  }

  function describe(index: number, selection: number): string {
    const label = labelOf.get(index) ?? "";
    const status = data ? CELL_STATUSES[data.status[index]] : undefined;
    return `Cell ${label}${status ? `, ${status.replaceAll("-", " ")}` : ""}${held.has(index) ? ", held" : ""}${assigned.has(index) ? `, planned on ${planDate}` : ""}. ${selection} selected.`;
  }

  function onMapKey(event: React.KeyboardEvent) {
    // Only the map region's own keys: a button or field inside it (the zoom buttons) keeps its keys.
    const onMap = event.target === event.currentTarget || (event.target as HTMLElement).tagName === "CANVAS";
    if (!onMap || event.altKey || event.ctrlKey || event.metaKey || typing(event.target)) return;
    const moves: Record<string, [number, number]> = { ArrowUp: [1, 0], ArrowDown: [-1, 0], ArrowLeft: [0, -1], ArrowRight: [0, 1] };
    const move = moves[event.key];
    const key = event.key.length === 1 ? event.key.toLowerCase() : event.key;
    if (move) {
      event.preventDefault();
      if (!data?.grid) return;
      const grid = data.grid;
      const from = startCell();
      if (from === null) return;
      let next = from;
      if (focus !== null) {
        // Step over cells outside the work limit to the next one inside, in that direction.
        let row = Math.floor(from / grid.cols), col = from % grid.cols;
        for (;;) {
          row += move[0];
          col += move[1];
          if (row < 0 || row >= grid.rows || col < 0 || col >= grid.cols) return;
          if (data.status[row * grid.cols + col] >= 0) break;
        }
        next = row * grid.cols + col;
      }
      const extend = event.shiftKey;
      const after = extend ? new Set([...selected, next]) : new Set([next]);
      setSelected(after);
      setFocus(next);
      setFlyTo({ lonLat: cellCentreLonLat(data, next), serial: Date.now() });
      setAnnouncement(describe(next, after.size));
      return;
    }
    if (key === " ") {
      event.preventDefault();
      const current = startCell();
      if (current === null) return;
      const after = new Set(selected);
      if (after.has(current)) after.delete(current);
      else after.add(current);
      setSelected(after);
      setFocus(current);
      setAnnouncement(`${describe(current, after.size)}${after.has(current) ? "" : " Removed from the selection."}`);
    } else if (key === "Enter") {
      event.preventDefault();
      const current = startCell();
      if (current === null) return;
      if (!selected.has(current)) setSelected(new Set([...selected, current]));
      setFocus(current);
      setPanelOpen(true);
      requestAnimationFrame(() => inspectorRef.current?.focus());
    } else if (key === "a") {
      event.preventDefault();
      if (!loaderData.canAssign) {
        setAnnouncement("Your role can read the map; dive supervisors and managers assign cells.");
        return;
      }
      setPanelOpen(true);
      requestAnimationFrame(() => assignRef.current?.querySelector<HTMLElement>("input, select, textarea, button")?.focus());
    } else if (key === "w") {
      event.preventDefault();
      // Step through the stations and sightings drawn on the map, each shown in the panel.
      const points = layers.monitoring ? locatedKeys(monitoring, shownSightings) : [];
      if (points.length === 0) {
        setAnnouncement(layers.monitoring ? "No station or sighting with a position is drawn." : "Turn on Stations and sightings under Map layers first.");
        return;
      }
      const at = points.findIndex((point) => point.key === chosenPoint);
      const next = points[(at + 1) % points.length];
      choosePoint(next.key, true);
      requestAnimationFrame(() => monitoringRef.current?.scrollIntoView({ block: "nearest" }));
      setAnnouncement(`${next.name}, ${at + 2 > points.length ? 1 : at + 2} of ${points.length}: read it in the panel.`);
    } else if (key === "Escape") {
      event.preventDefault();
      setSelected(new Set());
      setFocus(null);
      setAnnouncement("Selection cleared.");
    } else if (key === "p") {
      event.preventDefault();
      togglePanel();
    } else if (key === "f" || key === "/") {
      event.preventDefault();
      searchInput.current?.focus();
    } else if (key === "+" || key === "=") {
      event.preventDefault();
      setCameraCommand({ kind: "zoom-in", serial: Date.now() });
    } else if (key === "-") {
      event.preventDefault();
      setCameraCommand({ kind: "zoom-out", serial: Date.now() });
    } else if (key === "0") {
      event.preventDefault();
      setCameraCommand({ kind: "frame", serial: Date.now() });
    }
  }

  function runSearch(event: React.FormEvent) {
    event.preventDefault();
    const index = labels.get(search.trim().toUpperCase());
    if (index === undefined || !data) {
      setSearchMessage(`No cell "${search.trim()}" inside the work limit.`);
      return;
    }
    setSearchMessage(null);
    selectOne(index, false);
    setFlyTo({ lonLat: cellCentreLonLat(data, index), serial: Date.now() });
  }

  // A zone made here: the zones are read again (the map's outlines, the legend, the cells' zones).
  const zonesStamp = loaderData.zones.map((zone) => `${zone.id}:${zone.name}`).join("|");
  const onZoneMade = useCallback(() => {
    loadCells().catch(() => undefined);
  }, [loadCells]);

  const confirmedCode = CELL_STATUSES.indexOf("confirmed");
  const confirmedLabels = data ? [...selected].filter((index) => data.status[index] === confirmedCode).map((index) => labelOf.get(index)!).sort() : [];
  const focusLabel = focus === null ? null : labelOf.get(focus) ?? null;
  const projected = pointer && crs ? crs.fromLonLat(pointer[0], pointer[1]) : null;
  const cellCount = useMemo(() => (data ? buildCellCount(data) : 0), [data]);
  const heldSelected = selectedLabels.filter((label) => held.has(labels.get(label)!));

  const legendSections = useMemo<LegendSection[]>(() => {
    const sections: LegendSection[] = [];
    const unit = data?.labels.length ?? loaderData.lengthUnit;
    if (layers.bands) {
      // The bands on the map now: a newly chosen surface replaces them once it is read.
      const drawn = bands ? { surface: bands.surface, bounds: bands.collection.features.map((feature) => (feature.properties ?? { lower: null, upper: null }) as BandBounds) } : null;
      const surface = drawn?.surface ?? bandSurface;
      const reading = !drawn || drawn.surface !== bandSurface ? `Reading the ${BAND_TITLES[bandSurface].toLowerCase()}…` : null;
      const meaning = surface === "remaining" ? "Sediment left above firm sand" : "Depth of the latest bottom below the water surface";
      sections.push({
        title: BAND_TITLES[surface],
        note: [drawn ? (drawn.bounds.length === 0 ? "No bands yet: the project has no computed surface." : `${meaning}, in ${unit}; drawn over the cells.`) : null, reading].filter(Boolean).join(" "),
        entries: drawn ? bandLegend(drawn.surface, drawn.bounds, unit) : [],
      });
    }
    if (layers.cells && !data) sections.push({ title: VIEW_TITLES[view], note: loadError ? "The cells could not be read." : "Loading cells…", entries: [] });
    if (layers.cells && data) {
      const zoneName = zoneIndex === null ? null : data.zones[zoneIndex]?.name;
      sections.push({
        title: VIEW_TITLES[view],
        note: [view === "thickness" ? `Mean per cell, in ${data.labels.length}` : view === "removed" ? `Per cell, in ${data.labels.volume}` : null, zoneName ? `${zoneName} only` : null].filter(Boolean).join(" · ") || undefined,
        entries: legendFor(view, data),
      });
      const marks = [
        { colour: MARK_SWATCHES.planned, outline: MARK_STYLES.planned.line, label: `Planned on ${planDate} (${assigned.size})` },
        ...(held.size > 0 ? [{ colour: MARK_SWATCHES.held, outline: MARK_STYLES.held.line, label: "Held (stop-work hold)" }] : []),
        { colour: MARK_SWATCHES.selected, outline: MARK_STYLES.selected.line, label: `Selected (${selected.size})` },
      ];
      sections.push({ title: "Marked cells", entries: marks });
    }
    if (layers.zones && loaderData.zones.length > 0) {
      sections.push({
        title: "Zones",
        note: "Outlined, and named when Labels are on; where zones overlap, a shared cell counts in the earlier one.",
        entries: loaderData.zones.map((zone) => ({ colour: "#ffffff", outline: zone.colour, dashed: true, label: zone.name })),
      });
    }
    const tubes = loaderData.tubes;
    if (layers.tubes && tubes.count > 0) {
      sections.push({
        title: "Geotextile tubes",
        note: "On the laydown area, to scale; hauled tubes are not drawn.",
        entries: [
          { colour: TUBE_COLOURS.normal, label: `Tube (${tubes.count - tubes.nearCapacity})` },
          { colour: TUBE_COLOURS.nearCapacity, label: `Near capacity, at ${Math.round(tubes.nearCapacityShare * 100)} % or more (${tubes.nearCapacity})` },
        ],
      });
    }
    if (layers.monitoring) sections.push(...monitoringLegend(monitoring, shownSightings, sightingHours));
    return sections;
  }, [monitoring, shownSightings, sightingHours, layers.monitoring, layers.tubes, loaderData.tubes, layers.zones, loaderData.zones, layers.bands, layers.cells, bands, bandSurface, data, loadError, view, zoneIndex, planDate, assigned.size, held.size, selected.size, loaderData.lengthUnit]);

  if (!loaderData.hasWorkLimit) {
    return <p className="rounded border border-dashed border-line bg-panel p-6 text-muted">Set the project's work limit to see it on the map.</p>;
  }
  const summary = selectedLabels.length === 0 ? "No cells selected" : `${selectedLabels.length} selected: ${selectedLabels.slice(0, 6).join(", ")}${selectedLabels.length > 6 ? "…" : ""}`;
  return (
    <section aria-labelledby="map-title" className="relative flex h-full min-h-0 flex-col lg:flex-row">
      <div className="flex min-h-0 min-w-0 flex-1 flex-col max-lg:pb-12">
        <div className="flex flex-wrap items-center gap-x-3 gap-y-1 pb-2">
          <h2 id="map-title" className="text-base font-semibold">Coverage map</h2>
          <label className="text-sm">View
            <select aria-label="View" value={view} onChange={(event) => setView(event.target.value as MapView)} className="ml-1 rounded border border-line px-1 py-1">
              <option value="status">Status</option>
              <option value="thickness">Remaining thickness</option>
              <option value="removed">Removed volume</option>
            </select>
          </label>
          <label className="text-sm">Zone
            <select aria-label="Zone filter" value={zoneId ?? ""} onChange={(event) => setZoneId(event.target.value === "" ? null : Number(event.target.value))} className="ml-1 max-w-40 rounded border border-line px-1 py-1">
              <option value="">All zones</option>
              {data?.zones.map((zone) => <option key={zone.id} value={zone.id}>{zone.name}</option>)}
            </select>
          </label>
          <form onSubmit={runSearch} role="search" className="text-sm">
            <label>Cell <input ref={searchInput} aria-label="Search cell label" value={search} onChange={(event) => setSearch(event.target.value)} placeholder="e.g. C7" className="ml-1 w-20 rounded border border-line px-2 py-1" /></label>
            <button type="submit" className="ml-1 rounded border border-line px-2 py-1">Find</button>
          </form>
        </div>
        {loaderData.hasSurveys ? null : (
          <p className="mb-2 rounded border border-lagoon bg-panel px-3 py-2 text-sm" data-testid="next-step">
            The grid is empty. Next: import the baseline survey{loaderData.canImport ? <> — <Link to={`/projects/${projectId}/surveys/new`} className="text-lagoon underline">import it now</Link></> : " (a survey technician or the manager does this)"}.
          </p>
        )}
        {searchMessage ? <p role="alert" className="mb-2 text-sm text-danger">{searchMessage}</p> : null}
        <div className="relative min-h-[240px] flex-1">
          <div
            tabIndex={0}
            onKeyDown={onMapKey}
            aria-label="Cell map: arrow keys move the selected cell"
            aria-describedby="map-keys-list"
            className="absolute inset-0 rounded border border-line focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-lagoon"
          >
          <CoverageMap
            projectId={projectId}
            lengthUnit={loaderData.lengthUnit}
            data={data}
            view={view}
            layers={layers}
            zoneFilter={zoneIndex}
            selected={selected}
            assigned={assigned}
            held={held}
            bands={bands}
            flyTo={flyTo}
            onCellClick={selectOne}
            onBoxSelect={onBoxSelect}
            onPointer={setPointer}
            onBearing={setBearing}
            shorelineStamp={loaderData.shoreline?.uploadedAt ?? "none"}
            zonesStamp={zonesStamp}
            workLimit={loaderData.workLimit}
            extent={extent}
            initialCamera={initialCamera.current}
            onCamera={(centre, zoom) => setCamera({ centre, zoom })}
            cameraCommand={cameraCommand}
            loadError={loadError}
            monitoring={layers.monitoring ? monitoringShown : undefined}
            onMonitoringClick={(key) => {
              choosePoint(key, false);
              requestAnimationFrame(() => monitoringRef.current?.scrollIntoView({ block: "nearest" }));
            }}
          />
          </div>
          <div className="pointer-events-none absolute left-2 top-2 rounded bg-panel/90 p-1"><NorthArrow bearing={bearing} /></div>
          <div className="absolute bottom-8 right-2 max-h-[70%] max-w-[15rem] overflow-y-auto rounded border border-line bg-panel/95 p-2 shadow-sm">
            <MapLegend sections={legendSections} wide={wide} />
          </div>
          <p aria-live="polite" className="sr-only" data-testid="map-announcement">{announcement}</p>
        </div>
        <p className="figures truncate pt-1 text-xs text-muted" data-testid="coordinates">
          {projected && pointer
            ? `${loaderData.crsCode}: E ${projected[0].toFixed(1)} N ${projected[1].toFixed(1)} ${data?.labels.length ?? ""} · lon ${pointer[0].toFixed(6)} lat ${pointer[1].toFixed(6)}`
            : "Move the pointer over the map for coordinates."}
          {data ? ` · ${cellCount} cells` : ""}
        </p>
      </div>
      <MapPanel open={panelOpen} wide={wide} onToggle={togglePanel} summary={summary}>
        {heldSelected.length > 0 ? (
          <p className="rounded border border-danger bg-panel px-3 py-2 text-sm text-danger" data-testid="held-selection">
            Held: {heldSelected.join(", ")} {heldSelected.length === 1 ? "is" : "are"} under a stop-work hold and cannot be assigned.
          </p>
        ) : null}
        <div ref={inspectorRef} tabIndex={-1} aria-label="Cell inspector" className="focus-visible:outline-2 focus-visible:outline-lagoon">
          <CellInspector projectId={projectId} label={focusLabel} labels={data?.labels ?? { length: "", volume: "" }} refresh={refresh} />
        </div>
        <div ref={assignRef}>
          {loaderData.canAssign ? (
            <AssignPanel
              projectId={projectId}
              selectedLabels={selectedLabels}
              confirmedLabels={confirmedLabels}
              teams={loaderData.teams}
              minTeamSize={loaderData.minTeamSize}
              workStopped={loaderData.workStopped}
              onAssigned={(date) => {
                setPlanDate(date);
                loadAssigned(date).catch(() => undefined);
                loadCells().catch(() => undefined);
                setRefresh((value) => value + 1);
              }}
            />
          ) : (
            <p className="text-sm text-muted">Your role can read the map; dive supervisors and managers assign cells.</p>
          )}
        </div>
        {loaderData.canMakeZones ? (
          <ZoneFromCells projectId={projectId} selectedLabels={selectedLabels} onMade={onZoneMade} />
        ) : null}
        <div ref={monitoringRef}>
          <MonitoringPanel
            monitoring={monitoring}
            sightings={shownSightings}
            hours={sightingHours}
            onHours={setSightingHours}
            chosen={chosenPoint}
            onChoose={(key) => choosePoint(key, true)}
            lengthUnit={loaderData.lengthUnit}
          />
        </div>
        <fieldset className="space-y-2 rounded border border-line p-3 text-sm">
          <legend className="px-1 font-semibold">Map layers</legend>
          <div className="grid grid-cols-2 gap-1">
            {LAYER_KEYS.map((key) => (
              <label key={key} className="flex items-center gap-1">
                <input type="checkbox" checked={layers[key]} onChange={(event) => setLayers((current) => ({ ...current, [key]: event.target.checked }))} />
                {LAYER_NAMES[key]}
              </label>
            ))}
          </div>
          {layers.bands ? (
            <select aria-label="Band surface" value={bandSurface} onChange={(event) => setBandSurface(event.target.value as "remaining" | "depth")} className="rounded border border-line px-2 py-1">
              <option value="remaining">Remaining thickness bands</option>
              <option value="depth">Bottom depth bands</option>
            </select>
          ) : null}
          <label className="block">Plan date shown
            <input aria-label="Plan date shown" type="date" value={planDate} onChange={(event) => event.target.value && setPlanDate(event.target.value)} className="ml-2 rounded border border-line px-2 py-1" />
          </label>
        </fieldset>
        <MapKeysHelp />
        {loaderData.canConfigure ? <MapSettings shoreline={loaderData.shoreline} result={actionData ?? null} maxBytes={loaderData.shorelineMaxBytes} /> : null}
      </MapPanel>
    </section>
  );
}

function buildCellCount(data: CellsData): number {
  let count = 0;
  for (const code of data.status) if (code >= 0) count++;
  return count;
}
