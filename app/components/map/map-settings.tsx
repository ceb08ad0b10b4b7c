import { useEffect, useRef, useState } from "react";
import { Form, useNavigation } from "react-router";

interface ShorelineSummary {
  fileName: string;
  uploadedAt: string;
  polygons: number;
  vertices: number;
}

interface Result {
  intent: "upload" | "remove";
  ok: boolean;
  message: string;
}

/**
 * The manager's map settings: the optional shoreline drawn as the map's water. Upload or replace
 * it from a GeoJSON file; removing it asks to confirm first.
 */
export function MapSettings({ shoreline, result, maxBytes }: { shoreline: ShorelineSummary | null; result: Result | null; maxBytes: number }) {
  const navigation = useNavigation();
  const busy = navigation.state === "submitting";
  const [confirming, setConfirming] = useState(false);
  const fileInput = useRef<HTMLInputElement>(null);
  const keepButton = useRef<HTMLButtonElement>(null);
  useEffect(() => {
    if (result?.ok && fileInput.current) fileInput.current.value = "";
    if (result) setConfirming(false);
  }, [result]);
  useEffect(() => {
    if (confirming) keepButton.current?.focus();
  }, [confirming]);
  return (
    <section aria-labelledby="map-settings-title" className="space-y-2 rounded border border-line bg-panel p-3 text-sm">
      <h3 id="map-settings-title" className="text-base font-semibold">Map settings</h3>
      <h4 className="font-semibold">Shoreline</h4>
      <p data-testid="shoreline-current">
        {shoreline
          ? `${shoreline.fileName}: ${shoreline.polygons} polygon${shoreline.polygons === 1 ? "" : "s"}, ${shoreline.vertices.toLocaleString("en-US")} vertices, uploaded ${shoreline.uploadedAt.slice(0, 16).replace("T", " ")} UTC.`
          : "None: the map's water follows the work limit."}
      </p>
      <Form method="post" encType="multipart/form-data" aria-label="Upload shoreline" className="space-y-2">
        <label className="block">
          {shoreline ? "Replace with a GeoJSON file" : "GeoJSON file"}
          <input ref={fileInput} type="file" name="shoreline" accept=".geojson,.json,application/geo+json,application/json" required className="mt-1 block w-full" />
        </label>
        <p className="text-xs text-muted">
          Polygon or MultiPolygon (or a FeatureCollection of them) in longitude/latitude, WGS 84; closed rings that do not cross; near the work limit; at most {maxBytes / 1024 / 1024} MB.
        </p>
        <button type="submit" name="intent" value="upload" disabled={busy} className="rounded bg-lagoon px-3 py-1 text-white disabled:opacity-60">
          {shoreline ? "Replace shoreline" : "Upload shoreline"}
        </button>
      </Form>
      {shoreline && !confirming ? (
        <button type="button" onClick={() => setConfirming(true)} className="rounded border border-line px-3 py-1">Remove shoreline…</button>
      ) : null}
      {shoreline && confirming ? (
        <Form method="post" aria-label="Confirm shoreline removal" className="space-y-2 rounded border border-danger p-2">
          <p>Remove {shoreline.fileName}? The map's water will follow the work limit alone; upload the file again to bring it back.</p>
          <div className="flex gap-2">
            <button type="submit" name="intent" value="remove" disabled={busy} className="rounded bg-danger px-3 py-1 text-white">Remove the shoreline</button>
            <button ref={keepButton} type="button" onClick={() => setConfirming(false)} className="rounded border border-line px-3 py-1">Keep it</button>
          </div>
        </Form>
      ) : null}
      {result ? (
        <p role={result.ok ? "status" : "alert"} data-testid="shoreline-result" className={result.ok ? "text-ok" : "text-danger"}>{result.message}</p>
      ) : null}
    </section>
  );
}
