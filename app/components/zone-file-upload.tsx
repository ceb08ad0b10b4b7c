import type { GeoJSONSource } from "maplibre-gl";
import { useEffect, useId, useMemo, useState } from "react";
import { Form } from "react-router";
import { WORK_LIMIT_ACCEPT } from "../../shared/grid/work-limit-geojson";
import { unitLabel, type LengthUnit } from "../../shared/units";
import { ActionMessages } from "./form-message";
import { extentOfPolygons, useOfflineMap } from "./map/offline-map";
import { SubmitButton } from "./submit-button";
import { polygonsOf, type LonLatPolygons } from "./work-limit-outline";

/** One zone as the file gave it, checked (the settings action's answer to a preview). */
export interface PreviewedZone {
  source: string;
  name: string | null;
  lonLat: unknown;
  area: number | null;
  problems: string[];
}

export interface ZonesFileResult {
  intent: string;
  errors: Record<string, string>;
  notice: string | null;
  problems?: string[];
  zonesFile?: { fileName: string; format: string; note: string | null; problems: string[]; zones: PreviewedZone[] };
}

const PREVIEW_SOURCE = "zones-file-preview";
const PREVIEW_COLOUR = "#b34a12";
const emptyCollection = { type: "FeatureCollection" as const, features: [] };
const sourceWords = (source: string) => `${source[0].toUpperCase()}${source.slice(1)}`;

/** The zones read from the file on the project's map, over the work limit and the zones there are. */
function PreviewMap({ projectId, lengthUnit, zones, workLimit }: { projectId: number; lengthUnit: LengthUnit; zones: Array<{ name: string; geometry: LonLatPolygons }>; workLimit: LonLatPolygons | null }) {
  const extent = useMemo(() => extentOfPolygons([...zones.flatMap((zone) => polygonsOf(zone.geometry)), ...(workLimit ? polygonsOf(workLimit) : [])]), [zones, workLimit]);
  const { container, map, ready } = useOfflineMap(projectId, extent, { lengthUnit, ariaLabel: "The zones read from the file, not yet saved, on the project's map: arrow keys pan, + and − zoom" });
  useEffect(() => {
    if (!ready || !map) return;
    if (!map.getSource(PREVIEW_SOURCE)) {
      map.addSource(PREVIEW_SOURCE, { type: "geojson", data: emptyCollection });
      map.addLayer({ id: `${PREVIEW_SOURCE}-fill`, type: "fill", source: PREVIEW_SOURCE, paint: { "fill-color": PREVIEW_COLOUR, "fill-opacity": 0.18 } });
      map.addLayer({ id: `${PREVIEW_SOURCE}-line`, type: "line", source: PREVIEW_SOURCE, paint: { "line-color": PREVIEW_COLOUR, "line-width": 2.5 } });
      map.addLayer({
        id: `${PREVIEW_SOURCE}-labels`, type: "symbol", source: PREVIEW_SOURCE,
        layout: { "text-field": ["get", "name"], "text-font": ["Roboto Mono"], "text-size": 13, "text-allow-overlap": true },
        paint: { "text-color": PREVIEW_COLOUR, "text-halo-color": "#ffffff", "text-halo-width": 2 },
      });
    }
    (map.getSource(PREVIEW_SOURCE) as GeoJSONSource).setData({
      type: "FeatureCollection",
      features: zones.map((zone, index) => ({ type: "Feature", id: index, properties: { name: zone.name }, geometry: zone.geometry })),
    } as never);
    if (extent) map.fitBounds(extent, { padding: 24, animate: false });
  }, [ready, map, zones, extent]);
  return <div ref={container} className="h-72 w-full overflow-hidden rounded border border-line sm:h-96" data-testid="zones-file-map" data-ready={ready ? "" : undefined} data-zones={zones.length} />;
}

/**
 * Zones from a file: the same forms a work limit may come in (GeoJSON in the project's CRS or
 * lon/lat, KML, zipped shapefile, DXF, CSV), one zone per feature or polygon. The file is read and
 * each zone checked by the settings action; the zones are shown on the map and listed with their
 * names (from the file, or asked for) and problems, then added to the zones there are or made to
 * replace them, after the manager confirms which.
 */
export function ZoneFileUpload({ projectId, lengthUnit, workLimit, existing, surveyCount, result, disabled }: {
  projectId: number;
  lengthUnit: LengthUnit;
  workLimit: LonLatPolygons | null;
  existing: string[];
  surveyCount: number;
  result: ZonesFileResult | null;
  disabled: boolean;
}) {
  const fileId = useId();
  const read = result?.intent === "zones-file-preview" ? result.zonesFile ?? null : null;
  // The last file read stays on screen while its zones are named and saved (and after a refusal).
  const [shown, setShown] = useState(read);
  useEffect(() => {
    if (read) setShown(read);
  }, [read]);
  useEffect(() => {
    if (result?.intent === "zones-file-save" && result.notice) setShown(null);
  }, [result]);
  const [names, setNames] = useState<string[]>([]);
  useEffect(() => setNames(shown ? shown.zones.map((zone) => zone.name ?? "") : []), [shown]);
  const [mode, setMode] = useState<"add" | "replace">("add");
  const areaUnit = unitLabel(lengthUnit, "area");
  const good = shown ? shown.zones.filter((zone) => zone.problems.length === 0) : [];
  const refused = shown ? shown.zones.length - good.length : 0;
  const mapZones = useMemo(() => (shown ? shown.zones.flatMap((zone, index) => (zone.lonLat ? [{ name: names[index] || sourceWords(zone.source), geometry: zone.lonLat as LonLatPolygons }] : [])) : []), [shown, names]);
  const previewErrors = result?.intent === "zones-file-preview" ? result.errors : {};
  const saveResult = result?.intent === "zones-file-save" ? result : null;
  const surveysNote = surveyCount > 0 ? ` The project has ${surveyCount} survey${surveyCount === 1 ? "" : "s"}: saving recomputes their figures.` : "";

  const question = () => {
    const count = `${good.length} ${good.length === 1 ? "zone" : "zones"} from ${shown!.fileName}`;
    if (mode === "add") return `Add the ${count} after the ${existing.length} zones there are?${surveysNote}`;
    return `Replace the ${existing.length} zones there are (${existing.join(", ") || "none"}) by the ${count}? A zone of the same name keeps the records that name it; the others are deleted and their records lose the zone.${surveysNote}`;
  };

  return (
    <div className="space-y-3 border-t border-line pt-3" data-testid="zones-file">
      <h3 className="text-base font-semibold">Zones from a file</h3>
      <ActionMessages notice={saveResult?.notice} />
      <Form method="post" encType="multipart/form-data" className="space-y-2">
        <label htmlFor={fileId} className="block text-sm font-medium">File of zone outlines (GeoJSON, KML, zipped shapefile, DXF or CSV of vertices; in the project's CRS or lon/lat)</label>
        <input
          id={fileId} name="file" type="file" accept={WORK_LIMIT_ACCEPT} required className="block w-full text-sm" disabled={disabled || !workLimit}
          aria-invalid={previewErrors.zonesFile || previewErrors.file ? true : undefined} aria-describedby={`${fileId}-hint ${fileId}-error`}
        />
        <p id={`${fileId}-hint`} className="text-sm text-muted">One zone per feature (per closed outline in a DXF or CSV), named from its name or zone property; you can name the rest before saving.</p>
        <p id={`${fileId}-error`} className="text-sm text-danger">{previewErrors.zonesFile ?? previewErrors.file ?? ""}</p>
        <SubmitButton intent="zones-file-preview" tone="plain" pendingLabel="Reading…" disabled={disabled || !workLimit}>Preview the zones</SubmitButton>
      </Form>

      {shown ? (
        <div className="space-y-3" data-testid="zones-file-preview">
          <p className="text-sm">
            Read {shown.format} from <span className="figures">{shown.fileName}</span>: <span className="figures">{shown.zones.length}</span> {shown.zones.length === 1 ? "zone" : "zones"}
            {refused > 0 ? <>, <span className="figures">{refused}</span> of them refused (below)</> : null}.
          </p>
          {shown.note ? <p className="text-sm text-muted">{shown.note}</p> : null}
          {shown.problems.length > 0 ? (
            <ul className="list-disc pl-5 text-sm text-danger" aria-label="Left out of the file">{shown.problems.map((problem) => <li key={problem}>{problem}</li>)}</ul>
          ) : null}
          <PreviewMap projectId={projectId} lengthUnit={lengthUnit} zones={mapZones} workLimit={workLimit} />
          <Form method="post" className="space-y-3" onSubmit={(event) => { if (!window.confirm(question())) event.preventDefault(); }} aria-label="Save the zones from the file">
            <input type="hidden" name="zones" value={JSON.stringify(shown.zones.flatMap((zone, index) => (zone.lonLat && zone.problems.length === 0 ? [{ source: zone.source, name: names[index] ?? "", geometry: zone.lonLat }] : [])))} />
            <ol className="space-y-2">
              {shown.zones.map((zone, index) => (
                <li key={zone.source} className="border-t border-line pt-2 text-sm">
                  {zone.problems.length === 0 ? (
                    <div className="flex flex-wrap items-end gap-3">
                      <label className="block min-w-48 flex-1">
                        <span className="font-medium">{sourceWords(zone.source)}: zone name</span>
                        <input
                          value={names[index] ?? ""} required maxLength={120} onChange={(event) => setNames((current) => current.map((name, at) => (at === index ? event.target.value : name)))}
                          className="mt-1 block w-full rounded border border-line bg-panel px-3 py-2 focus:outline-2 focus:outline-offset-1 focus:outline-lagoon"
                        />
                      </label>
                      <span className="pb-2 text-muted">{zone.name ? "named in the file" : "no name in the file"}; area <span className="figures">{Math.round(zone.area ?? 0).toLocaleString("en-US")}</span> {areaUnit}</span>
                    </div>
                  ) : (
                    <div className="text-danger">
                      <p className="font-medium">{sourceWords(zone.source)}{zone.name ? ` ("${zone.name}")` : ""} is left out:</p>
                      <ul className="list-disc pl-5">{zone.problems.map((problem) => <li key={problem}>{problem}</li>)}</ul>
                    </div>
                  )}
                </li>
              ))}
            </ol>
            <fieldset className="space-y-1 text-sm">
              <legend className="font-medium">The zones there are ({existing.length})</legend>
              <label className="flex items-center gap-2"><input type="radio" name="mode" value="add" checked={mode === "add"} onChange={() => setMode("add")} /> Add the file's zones after them</label>
              <label className="flex items-center gap-2"><input type="radio" name="mode" value="replace" checked={mode === "replace"} onChange={() => setMode("replace")} /> Replace them by the file's zones</label>
            </fieldset>
            {saveResult && !saveResult.notice ? (
              <div role="alert" className="text-sm text-danger">
                <p>{saveResult.errors.zonesFile ?? saveResult.errors.form ?? Object.values(saveResult.errors).join(" ")}</p>
                {saveResult.problems?.length ? <ul className="list-disc pl-5">{saveResult.problems.map((problem) => <li key={problem}>{problem}</li>)}</ul> : null}
              </div>
            ) : null}
            <SubmitButton intent="zones-file-save" pendingLabel="Saving…" disabled={disabled || good.length === 0}>
              {mode === "add" ? `Add ${good.length} ${good.length === 1 ? "zone" : "zones"}` : `Replace the zones by ${good.length}`}
            </SubmitButton>
          </Form>
        </div>
      ) : null}
    </div>
  );
}
