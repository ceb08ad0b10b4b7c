import type { FeatureCollection } from "geojson";
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { data, Link } from "react-router";
import { createCrs } from "../../shared/crs";
import { CELL_STATUSES } from "../../shared/cell-status";
import { AssignPanel } from "~/components/map/assign-panel";
import { CellInspector } from "~/components/map/cell-inspector";
import { cellCentreLonLat, labelIndex, type CellsData } from "~/components/map/cell-features";
import type { LonLatWorkLimit } from "~/components/map/clip-cells";
import { CoverageMap, type LayerKey } from "~/components/map/coverage-map";
import { MapLegend } from "~/components/map/legend";
import { NorthArrow } from "~/components/map/north-arrow";
import { legendFor, type MapView } from "~/components/map/paint";
import { MapSettings } from "~/components/map/map-settings";
import { can } from "~/lib/auth/permissions";
import { requireRole } from "~/lib/auth/access.server";
import { clientAddress } from "~/lib/http/client-address.server";
import { fileTooLargeMessage } from "~/lib/http/upload-size.server";
import { readFileForm } from "~/lib/http/body.server";
import { DomainError } from "~/lib/errors";
import { listDiveTeams } from "~/models/assignments.server";
import { heldCellLabels } from "~/models/holds.server";
import { listSurveys } from "~/models/survey.server";
import { findProject } from "~/lib/auth/project-view.server";
import { SHORELINE_MAX_BYTES } from "~/models/shoreline-geojson";
import { getShoreline, removeShoreline, saveShoreline } from "~/models/shoreline.server";
import { currentStoppages, workStoppedMessage } from "~/models/stoppages.server";
import type { Route } from "./+types/projects.$projectId.map";

export async function loader({ request, params }: Route.LoaderArgs) {
  const access = await requireRole(request, params.projectId);
  const { project } = access;
  // Held cells for those who read finds (outreach sees nothing of finds): "held", no details.
  const canReadFinds = can(access, "finds.read");
  const [teams, shoreline, row, surveys, stoppages, heldCells] = await Promise.all([
    listDiveTeams(project), getShoreline(project), findProject(project.id), listSurveys(project), currentStoppages(project), canReadFinds ? heldCellLabels(project.id) : Promise.resolve([]),
  ]);
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
    shoreline,
    shorelineMaxBytes: SHORELINE_MAX_BYTES,
    // Lon/lat, as stored: the browser clips the cells along it.
    workLimit: row?.workLimitGeoJson ? (JSON.parse(row.workLimitGeoJson) as LonLatWorkLimit) : null,
    heldCells,
    teams: teams.map((team) => ({ id: team.id, name: team.name, hoses: team.hoses, size: team.members.length, belowMinimum: team.belowMinimum })),
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

export function meta() {
  return [{ title: "Coverage map · Firmsand" }];
}

/** How often a visible map asks whether the cells changed (a 304 when they did not). */
const POLL_MS = 30_000;

const VIEW_TITLES: Record<MapView, string> = { status: "Cell status", thickness: "Remaining sediment thickness", removed: "Removed volume per cell" };

export default function ProjectMap({ loaderData, actionData }: Route.ComponentProps) {
  const { projectId } = loaderData;
  const [data, setData] = useState<CellsData | null>(null);
  const [loadError, setLoadError] = useState<string | null>(null);
  const [view, setView] = useState<MapView>("status");
  const [layers, setLayers] = useState<Record<LayerKey, boolean>>({ cells: true, bands: false, zones: true, workLimit: true, shoreline: true, labels: true });
  const [bandSurface, setBandSurface] = useState<"remaining" | "depth">("remaining");
  const [bands, setBands] = useState<{ surface: "remaining" | "depth"; collection: FeatureCollection } | null>(null);
  const [zoneFilter, setZoneFilter] = useState<number | null>(null);
  const [selected, setSelected] = useState<ReadonlySet<number>>(new Set());
  const [focus, setFocus] = useState<number | null>(null);
  const [assigned, setAssigned] = useState<ReadonlySet<number>>(new Set());
  const [planDate, setPlanDate] = useState(() => new Date(Date.now() + 86_400_000).toISOString().slice(0, 10));
  const [pointer, setPointer] = useState<[number, number] | null>(null);
  const [bearing, setBearing] = useState(0);
  const [flyTo, setFlyTo] = useState<{ lonLat: [number, number]; serial: number } | null>(null);
  const [search, setSearch] = useState("");
  const [searchMessage, setSearchMessage] = useState<string | null>(null);
  const [refresh, setRefresh] = useState(0);

  // The cells' ETag is the project's cells version: a conditional re-read costs a 304 and no
  // redraw until an import, a retract or a settings change makes a new version.
  const cellsVersion = useRef<string | null>(null);
  const loadCells = useCallback(async () => {
    const headers: HeadersInit = cellsVersion.current ? { "If-None-Match": cellsVersion.current } : {};
    const response = await fetch(`/api/projects/${projectId}/cells`, { headers, cache: "no-store" });
    if (response.status === 304) return false;
    if (!response.ok) throw new Error(`the cells could not be read (${response.status})`);
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
      loadCells().catch(() => undefined);
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
  }, [loadCells, loadAssigned, planDate]);

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

  function moveFocus(event: React.KeyboardEvent) {
    if (!data?.grid || focus === null) return;
    const moves: Record<string, [number, number]> = { ArrowUp: [1, 0], ArrowDown: [-1, 0], ArrowLeft: [0, -1], ArrowRight: [0, 1] };
    const move = moves[event.key];
    if (!move) return;
    event.preventDefault();
    const grid = data.grid;
    const row = Math.floor(focus / grid.cols) + move[0];
    const col = (focus % grid.cols) + move[1];
    if (row < 0 || row >= grid.rows || col < 0 || col >= grid.cols) return;
    const next = row * grid.cols + col;
    if (data.status[next] < 0) return;
    selectOne(next, event.shiftKey);
    setFlyTo({ lonLat: cellCentreLonLat(data, next), serial: Date.now() });
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

  const selectedLabels = [...selected].map((index) => labelOf.get(index)).filter((label): label is string => Boolean(label)).sort();
  const confirmedCode = CELL_STATUSES.indexOf("confirmed");
  const confirmedLabels = data ? [...selected].filter((index) => data.status[index] === confirmedCode).map((index) => labelOf.get(index)!).sort() : [];
  const focusLabel = focus === null ? null : labelOf.get(focus) ?? null;
  const projected = pointer && crs ? crs.fromLonLat(pointer[0], pointer[1]) : null;
  const cellCount = useMemo(() => (data ? buildCellCount(data) : 0), [data]);

  if (!loaderData.hasWorkLimit) {
    return <p className="rounded border border-dashed border-line bg-panel p-6 text-muted">Set the project's work limit to see it on the map.</p>;
  }
  return (
    <section aria-labelledby="map-title" className="space-y-3">
      {loaderData.hasSurveys ? null : (
        <p className="rounded border border-lagoon bg-panel px-3 py-2 text-sm" data-testid="next-step">
          The grid is empty. Next: import the baseline survey{loaderData.canImport ? <> — <Link to={`/projects/${projectId}/surveys/new`} className="text-lagoon underline">import it now</Link></> : " (a survey technician or the manager does this)"}.
        </p>
      )}
      <div className="flex flex-wrap items-end gap-3">
        <h2 id="map-title" className="text-lg font-semibold">Coverage map</h2>
        <label className="text-sm">View
          <select aria-label="View" value={view} onChange={(event) => setView(event.target.value as MapView)} className="ml-2 rounded border border-line px-2 py-1">
            <option value="status">Status</option>
            <option value="thickness">Remaining thickness</option>
            <option value="removed">Removed volume</option>
          </select>
        </label>
        <label className="text-sm">Zone
          <select aria-label="Zone filter" value={zoneFilter ?? ""} onChange={(event) => setZoneFilter(event.target.value === "" ? null : Number(event.target.value))} className="ml-2 rounded border border-line px-2 py-1">
            <option value="">All zones</option>
            {data?.zones.map((zone, index) => <option key={zone.id} value={index}>{zone.name}</option>)}
          </select>
        </label>
        <form onSubmit={runSearch} role="search" className="text-sm">
          <label>Cell <input aria-label="Search cell label" value={search} onChange={(event) => setSearch(event.target.value)} placeholder="e.g. C7" className="ml-2 w-24 rounded border border-line px-2 py-1" /></label>
          <button type="submit" className="ml-1 rounded border border-line px-2 py-1">Find</button>
        </form>
        <label className="text-sm">Plan date shown
          <input aria-label="Plan date shown" type="date" value={planDate} onChange={(event) => setPlanDate(event.target.value)} className="ml-2 rounded border border-line px-2 py-1" />
        </label>
      </div>
      {searchMessage ? <p role="alert" className="text-sm text-danger">{searchMessage}</p> : null}
      {loadError ? <p role="alert" className="text-danger">{loadError}</p> : null}
      <fieldset className="flex flex-wrap gap-3 text-sm">
        <legend className="sr-only">Layers</legend>
        {(Object.keys(layers) as LayerKey[]).map((key) => (
          <label key={key} className="flex items-center gap-1">
            <input type="checkbox" checked={layers[key]} onChange={(event) => setLayers((current) => ({ ...current, [key]: event.target.checked }))} />
            {{ cells: "Cells", bands: "Bands", zones: "Zones", workLimit: "Work limit", shoreline: "Shoreline", labels: "Labels" }[key]}
          </label>
        ))}
        {layers.bands ? (
          <select aria-label="Band surface" value={bandSurface} onChange={(event) => setBandSurface(event.target.value as "remaining" | "depth")} className="rounded border border-line px-2 py-1">
            <option value="remaining">Remaining thickness bands</option>
            <option value="depth">Bottom depth bands</option>
          </select>
        ) : null}
      </fieldset>
      <div className="grid gap-4 lg:grid-cols-[1fr_18rem]">
        <div tabIndex={0} onKeyDown={moveFocus} aria-label="Cell map: arrow keys move the selected cell" className="relative focus-visible:outline-2 focus-visible:outline-lagoon">
          <CoverageMap
            projectId={projectId}
            lengthUnit={loaderData.lengthUnit}
            data={data}
            view={view}
            layers={layers}
            zoneFilter={zoneFilter}
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
            workLimit={loaderData.workLimit}
          />
          <div className="pointer-events-none absolute left-2 top-2 rounded bg-panel/90 p-1"><NorthArrow bearing={bearing} /></div>
          <p className="figures mt-1 text-xs text-muted" data-testid="coordinates">
            {projected && pointer
              ? `${loaderData.crsCode}: E ${projected[0].toFixed(1)} N ${projected[1].toFixed(1)} ${data?.labels.length ?? ""} · lon ${pointer[0].toFixed(6)} lat ${pointer[1].toFixed(6)}`
              : "Move the pointer over the map for coordinates."}
            {data ? ` · ${cellCount} cells` : ""}
          </p>
        </div>
        <aside className="space-y-4">
          {data ? <MapLegend title={VIEW_TITLES[view]} entries={held.size > 0 ? [...legendFor(view, data), { label: "Held (stop-work hold)", colour: "rgba(163, 36, 42, 0.55)" }] : legendFor(view, data)} /> : null}
          {selectedLabels.some((label) => held.has(labels.get(label)!)) ? (
            <p className="rounded border border-danger bg-panel px-3 py-2 text-sm text-danger" data-testid="held-selection">
              Held: {selectedLabels.filter((label) => held.has(labels.get(label)!)).join(", ")} {selectedLabels.filter((label) => held.has(labels.get(label)!)).length === 1 ? "is" : "are"} under a stop-work hold and cannot be assigned.
            </p>
          ) : null}
          <CellInspector projectId={projectId} label={focusLabel} labels={data?.labels ?? { length: "", volume: "" }} refresh={refresh} />
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
          {loaderData.canConfigure ? <MapSettings shoreline={loaderData.shoreline} result={actionData ?? null} maxBytes={loaderData.shorelineMaxBytes} /> : null}
        </aside>
      </div>
    </section>
  );
}

function buildCellCount(data: CellsData): number {
  let count = 0;
  for (const code of data.status) if (code >= 0) count++;
  return count;
}

