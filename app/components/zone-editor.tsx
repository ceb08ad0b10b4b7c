import type { GeoJSONSource, Map as MapLibreMap } from "maplibre-gl";
import { useEffect, useId, useRef, useState } from "react";
import { Form } from "react-router";
import "maplibre-gl/dist/maplibre-gl.css";
import { loadMapFonts, loadMapLibre } from "./map/load-maplibre";
import { mapStyleUrl } from "./map/map-urls";
import { ConfirmedActionForm } from "./confirmed-action-form";
import { ActionMessages } from "./form-message";
import { addsVertex, draftFeatures, draftPolygon, MIN_ZONE_VERTICES, type LonLat } from "./map/zone-draft";
import { SubmitButton } from "./submit-button";
import { TextField } from "./text-field";
import { polygonsOf, type LonLatPolygons } from "./work-limit-outline";
import { ZoneColourField } from "./zone-colour-field";
import { ZoneSwatch } from "./zone-swatch";
import { defaultZoneColour } from "../../shared/zone-colours";

export interface EditableZone {
  id: number;
  name: string;
  /** One of the palette's (shared/zone-colours.ts). */
  colour: string;
  geometry: LonLatPolygons;
}

interface Props {
  projectId: number;
  lengthUnit: string;
  workLimit: LonLatPolygons | null;
  zones: EditableZone[];
  /** The last zone action's answer (save or delete), for this section only. */
  result: { intent: string; errors: Record<string, string>; notice: string | null } | null;
  disabled: boolean;
}

type Mode = "idle" | "drawing" | "drawn";

function extentOf(geometry: LonLatPolygons): [[number, number], [number, number]] {
  let west = Infinity, south = Infinity, east = -Infinity, north = -Infinity;
  for (const polygon of polygonsOf(geometry)) {
    for (const [lon, lat] of polygon[0] ?? []) {
      west = Math.min(west, lon); east = Math.max(east, lon);
      south = Math.min(south, lat); north = Math.max(north, lat);
    }
  }
  return [[west, south], [east, north]];
}

const zoneCollection = (zones: EditableZone[]) => ({
  type: "FeatureCollection" as const,
  features: zones.map((zone, index) => ({ type: "Feature" as const, id: index, properties: { name: zone.name, zone: index, colour: zone.colour }, geometry: zone.geometry })),
});

const buttonClass = "rounded border border-line bg-panel px-3 py-2 text-sm font-medium hover:bg-paper focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-lagoon disabled:opacity-50";

/**
 * The Zones section: the project's map (the same offline style as the map page) on which the
 * manager draws a zone by clicking its corners, names it and saves it through the settings
 * page's action, which checks it as any zone sent to the project (closed, not crossing itself,
 * in the CRS's area of use, inside the work limit). A small click-to-draw of our own: no
 * drawing library is needed for one polygon at a time.
 */
export function ZoneEditor({ projectId, lengthUnit, workLimit, zones, result, disabled }: Props) {
  const container = useRef<HTMLDivElement>(null);
  const mapRef = useRef<MapLibreMap | null>(null);
  const [ready, setReady] = useState(false);
  const [mode, setMode] = useState<Mode>("idle");
  const [vertices, setVertices] = useState<LonLat[]>([]);
  const [hint, setHint] = useState<string | null>(null);
  // The zone whose outline is being drawn again; null: a new zone.
  const [redrawId, setRedrawId] = useState<number | null>(null);
  const redrawing = redrawId === null ? null : zones.find((zone) => zone.id === redrawId) ?? null;
  const instructionsId = useId();
  // The map's handlers read the draft through refs: they are bound once.
  const modeRef = useRef(mode);
  modeRef.current = mode;
  const verticesRef = useRef(vertices);
  verticesRef.current = vertices;

  const start = (zoneId: number | null = null) => {
    setRedrawId(zoneId);
    setVertices([]);
    setHint(null);
    setMode("drawing");
    mapRef.current?.getCanvas().focus();
  };
  const cancel = () => {
    setVertices([]);
    setHint(null);
    setRedrawId(null);
    setMode("idle");
  };
  const undo = () => setVertices((current) => current.slice(0, -1));
  const finish = () => {
    const count = verticesRef.current.length;
    if (count < MIN_ZONE_VERTICES) {
      setHint(`A zone needs at least ${MIN_ZONE_VERTICES} corners: ${count} so far.`);
      return;
    }
    setHint(null);
    setMode("drawn");
  };
  const addVertex = (vertex: LonLat) => setVertices((current) => [...current, vertex]);
  const actions = useRef({ finish, undo, cancel, addVertex });
  actions.current = { finish, undo, cancel, addVertex };

  useEffect(() => {
    let cancelled = false;
    let map: MapLibreMap | null = null;
    (async () => {
      const [maplibre] = await Promise.all([loadMapLibre(), loadMapFonts()]);
      if (cancelled || !container.current) return;
      map = new maplibre.Map({
        container: container.current,
        style: mapStyleUrl(window.location.origin, projectId),
        ...(workLimit ? { bounds: extentOf(workLimit), fitBoundsOptions: { padding: 24 } } : { center: [0, 0] as [number, number], zoom: 1 }),
        attributionControl: false,
        canvasContextAttributes: { preserveDrawingBuffer: true },
      });
      mapRef.current = map;
      // For the browser tests and for debugging from the console.
      (window as unknown as { firmsandZoneMap?: MapLibreMap }).firmsandZoneMap = map;
      const canvas = map.getCanvas();
      canvas.setAttribute("aria-label", "Zones map: arrow keys pan, + and − zoom");
      canvas.setAttribute("aria-describedby", instructionsId);
      map.addControl(new maplibre.NavigationControl({ showCompass: false }), "top-right");
      // Until the manager moves the map, it keeps the work limit framed when its box changes
      // (a phone turned, a window resized).
      let moved = false;
      map.on("movestart", (event) => { if ((event as { originalEvent?: Event }).originalEvent) moved = true; });
      map.on("resize", () => {
        if (!moved && workLimit && map) map.fitBounds(extentOf(workLimit), { padding: 24, animate: false });
      });
      map.addControl(new maplibre.ScaleControl({ unit: lengthUnit === "m" ? "metric" : "imperial", maxWidth: 100 }), "bottom-left");
      map.on("load", () => {
        if (cancelled || !map) return;
        map.addSource("zone-draft", { type: "geojson", data: draftFeatures([]) as never });
        map.addLayer({ id: "zone-draft-fill", type: "fill", source: "zone-draft", filter: ["has", "fill"], paint: { "fill-color": "#1f7a8c", "fill-opacity": 0.25 } });
        map.addLayer({ id: "zone-draft-line", type: "line", source: "zone-draft", filter: ["has", "outline"], paint: { "line-color": "#0d4650", "line-width": 2 } });
        map.addLayer({ id: "zone-draft-vertices", type: "circle", source: "zone-draft", filter: ["has", "vertex"], paint: { "circle-radius": 5, "circle-color": "#ffffff", "circle-stroke-color": "#0d4650", "circle-stroke-width": 2 } });
        setReady(true);
      });
      let lastPoint: { x: number; y: number } | null = null;
      map.on("click", (event) => {
        if (modeRef.current !== "drawing") return;
        const last = verticesRef.current.length > 0 ? lastPoint : null;
        if (!addsVertex(last, event.point)) return;
        lastPoint = { x: event.point.x, y: event.point.y };
        actions.current.addVertex([event.lngLat.lng, event.lngLat.lat]);
      });
      map.on("dblclick", (event) => {
        if (modeRef.current !== "drawing") return;
        event.preventDefault(); // no zoom: the double-click finishes the outline
        actions.current.finish();
      });
      // Keys while drawing, on the focused map: Enter finishes, Backspace takes back the last
      // corner, Escape drops the outline, Space puts a corner at the centre (the crosshair).
      map.getCanvasContainer().addEventListener("keydown", (event) => {
        if (modeRef.current !== "drawing" || !map) return;
        if (event.key === "Enter") actions.current.finish();
        else if (event.key === "Backspace") actions.current.undo();
        else if (event.key === "Escape") actions.current.cancel();
        else if (event.key === " ") {
          const centre = map.getCenter();
          lastPoint = map.project(centre);
          actions.current.addVertex([centre.lng, centre.lat]);
        } else return;
        event.preventDefault();
      });
    })();
    return () => {
      cancelled = true;
      map?.remove();
      mapRef.current = null;
    };
    // The map is made once per project.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [projectId]);

  // The draft on the map follows the state.
  useEffect(() => {
    if (!ready) return;
    (mapRef.current?.getSource("zone-draft") as GeoJSONSource | undefined)?.setData(draftFeatures(vertices) as never);
  }, [ready, vertices]);

  // The saved zones (the style's source was read once) follow the page's data after each save.
  useEffect(() => {
    if (!ready) return;
    (mapRef.current?.getSource("zones") as GeoJSONSource | undefined)?.setData(zoneCollection(zones) as never);
  }, [ready, zones]);

  useEffect(() => {
    const map = mapRef.current;
    if (!map) return;
    map.getCanvas().style.cursor = mode === "drawing" ? "crosshair" : "";
  }, [mode]);

  // A zone saved: the draft is done with.
  useEffect(() => {
    if (result?.intent === "zone-save" && result.notice) {
      setVertices([]);
      setRedrawId(null);
      setMode("idle");
    }
  }, [result]);

  const errors = result?.errors ?? {};
  const saveErrors = result?.intent === "zone-save" ? errors : {};
  return (
    <div className="space-y-3">
      {/* A refused rename or delete is said here; a refused new zone beside its name. */}
      <ActionMessages error={errors.form ?? (mode === "drawn" ? undefined : errors.name ?? errors.geometry ?? errors.zoneId ?? errors.colour)} notice={result?.notice} />
      <p id={instructionsId} className="text-sm text-muted">
        Draw a zone: choose <strong>Draw a zone</strong>, click its corners on the map (or pan with the arrow keys and press Space for a corner at the crosshair),
        then double-click or press Enter to finish. Backspace takes back the last corner; Escape drops the outline. A zone must lie inside the work limit;
        where two zones overlap, the shared cells count in the earlier one.
      </p>
      <div className="relative">
        <div ref={container} className="h-80 w-full overflow-hidden rounded border border-line sm:h-[28rem]" data-testid="zone-map" data-ready={ready ? "" : undefined} data-mode={mode} data-vertices={vertices.length} />
        {mode === "drawing" ? (
          <div aria-hidden="true" className="pointer-events-none absolute left-1/2 top-1/2 h-5 w-5 -translate-x-1/2 -translate-y-1/2 text-center leading-5 text-lagoon-dark">+</div>
        ) : null}
      </div>
      <div className="flex flex-wrap items-center gap-2" role="group" aria-label="Drawing">
        {mode === "idle" ? (
          <button type="button" className={buttonClass} onClick={() => start()} disabled={disabled || !ready || !workLimit}>Draw a zone</button>
        ) : null}
        {mode === "drawing" ? (
          <>
            <button type="button" className={buttonClass} onClick={finish}>Finish outline</button>
            <button type="button" className={buttonClass} onClick={undo} disabled={vertices.length === 0}>Undo last corner</button>
            <button type="button" className={buttonClass} onClick={cancel}>Cancel</button>
          </>
        ) : null}
        <p className="text-sm" aria-live="polite" data-testid="zone-draft-state">
          {mode === "drawing" ? <>{redrawing ? `New outline of ${redrawing.name}: ` : "Drawing: "}<span className="figures">{vertices.length}</span> {vertices.length === 1 ? "corner" : "corners"}.</> : null}
          {hint ? <span className="ml-1 text-danger">{hint}</span> : null}
        </p>
      </div>
      {!workLimit ? <p className="text-sm text-muted">Zones are drawn inside the work limit: set the work limit first.</p> : null}

      {mode === "drawn" ? (
        <Form method="post" className="grid gap-3 rounded border border-line p-3 sm:grid-cols-[1fr_auto]" aria-label={redrawing ? `New outline of ${redrawing.name}` : "New zone"}>
          <input type="hidden" name="geometry" value={vertices.length >= MIN_ZONE_VERTICES ? JSON.stringify(draftPolygon(vertices)) : ""} />
          {redrawing ? (
            <>
              <input type="hidden" name="zoneId" value={redrawing.id} />
              <input type="hidden" name="name" value={redrawing.name} />
              <p className="self-end text-sm">The new outline replaces that of <strong>{redrawing.name}</strong>; the zone keeps its name, place in the order and the records that name it.</p>
            </>
          ) : (
            <div className="flex flex-wrap items-end gap-3">
              <TextField className="min-w-48 flex-1" label="Name of the new zone" name="name" required maxLength={120} error={saveErrors.name} autoFocus />
              <ZoneColourField label="Colour" defaultValue={defaultZoneColour(zones.map((zone) => zone.colour), zones.length)} error={saveErrors.colour} />
            </div>
          )}
          <div className="flex items-end gap-2">
            <SubmitButton intent="zone-save" pendingLabel="Saving…">{redrawing ? "Save the outline" : "Save zone"}</SubmitButton>
            <button type="button" className={buttonClass} onClick={cancel}>Discard</button>
          </div>
          {saveErrors.geometry ? <p role="alert" className="text-sm text-danger sm:col-span-2">{saveErrors.geometry}</p> : null}
        </Form>
      ) : null}

      {zones.length === 0 ? (
        <p className="text-sm text-muted">No zones yet: the whole work limit counts as one (Unzoned).</p>
      ) : (
        <ol className="space-y-2" aria-label="Zones">
          {zones.map((zone, index) => (
            <li key={zone.id} className="flex flex-wrap items-end gap-2 border-t border-line pt-2">
              <span className="figures flex w-12 items-center pb-2 text-sm"><ZoneSwatch colour={zone.colour} />{index + 1}.</span>
              <Form method="post" className="flex flex-1 flex-wrap items-end gap-2">
                <input type="hidden" name="zoneId" value={zone.id} />
                <TextField className="min-w-48 flex-1" label={`Name of zone ${index + 1}`} name="name" defaultValue={zone.name} required maxLength={120} key={zone.name} />
                <SubmitButton intent="zone-save" tone="plain" pendingLabel="Saving…" aria-label={`Rename zone ${zone.name}`}>Rename</SubmitButton>
              </Form>
              <Form method="post" className="flex items-end gap-2">
                <input type="hidden" name="zoneId" value={zone.id} />
                <ZoneColourField label={`Colour of zone ${index + 1}`} defaultValue={zone.colour} key={zone.colour} />
                <SubmitButton intent="zone-colour" tone="plain" pendingLabel="Saving…" aria-label={`Set colour of zone ${zone.name}`}>Set colour</SubmitButton>
              </Form>
              <button type="button" className={buttonClass} onClick={() => start(zone.id)} disabled={disabled || !ready || mode !== "idle"} aria-label={`Redraw the outline of zone ${zone.name}`}>Redraw</button>
              {(["up", "down"] as const).map((direction) => (
                <Form method="post" key={direction}>
                  <input type="hidden" name="zoneId" value={zone.id} />
                  <input type="hidden" name="direction" value={direction} />
                  <SubmitButton
                    intent="zone-move" tone="plain" pendingLabel="…" title={`Move ${direction}: where zones overlap, the shared cells count in the earlier one`}
                    disabled={direction === "up" ? index === 0 : index === zones.length - 1} aria-label={`Move zone ${zone.name} ${direction}`}
                  >{direction === "up" ? "↑" : "↓"}</SubmitButton>
                </Form>
              ))}
              <ConfirmedActionForm
                question={`Delete zone ${zone.name}? Its cells become Unzoned (or fall to an overlapping zone), and records that name it lose the zone.`}
                intent="zone-delete" fields={{ zoneId: zone.id }}
                label="Delete" pendingLabel="Deleting…" accessibleName={`Delete zone ${zone.name}`}
              />
            </li>
          ))}
        </ol>
      )}
    </div>
  );
}
