import { useEffect, useMemo, useState } from "react";
import { createCrs } from "../../../shared/crs";
import { cellCentreLonLat, labelIndex, type CellsData } from "~/components/map/cell-features";
import { workLimitExtent, type LonLatWorkLimit } from "~/components/map/clip-cells";
import { mapCellsUrl } from "~/components/map/map-urls";
import { CoverageMap, type LayerKey } from "~/components/map/coverage-map";
import { MARK_STYLES, MARK_SWATCHES } from "~/components/map/paint";

/**
 * The log-a-find form's small map: the coverage map's own component over the project's offline
 * style, showing cells only. A tap picks the cell (and, when asked, the position tapped, in the
 * project's coordinates); the chosen dive's or plan's cells are outlined, held cells drawn as held.
 * The cell field beside it stays the way to pick by keyboard.
 */

const LAYERS: Record<LayerKey, boolean> = { cells: true, bands: false, zones: false, workLimit: true, shoreline: true, labels: true, monitoring: false, tubes: false };
const NONE: ReadonlySet<number> = new Set();

interface Props {
  projectId: number;
  lengthUnit: CellsData["lengthUnit"];
  workLimit: LonLatWorkLimit | null;
  /** The cell picked now (its label), if any. */
  cell: string;
  /** Cells the chosen dive worked, or the plan gave the team: outlined. */
  suggested: string[];
  /** Cells under an open stop-work hold: drawn as held. */
  held: string[];
  onPick: (cell: string, position: { x: number; y: number }) => void;
}

export function CellPickerMap({ projectId, lengthUnit, workLimit, cell, suggested, held, onPick }: Props) {
  const [data, setData] = useState<CellsData | null>(null);
  const [loadError, setLoadError] = useState<string | null>(null);
  useEffect(() => {
    let cancelled = false;
    fetch(mapCellsUrl(projectId), { cache: "no-store" })
      .then(async (response) => {
        if (!response.ok) throw new Error(`the server answered ${response.status}`);
        const next = (await response.json()) as CellsData;
        if (!cancelled) setData(next);
      })
      .catch((error: Error) => !cancelled && setLoadError(error.message));
    return () => {
      cancelled = true;
    };
  }, [projectId]);

  const labels = useMemo(() => (data ? labelIndex(data) : new Map<string, number>()), [data]);
  const labelOf = useMemo(() => new Map([...labels].map(([label, index]) => [index, label])), [labels]);
  const crs = useMemo(() => (data ? createCrs(data.crs.definition) : null), [data]);
  const indicesOf = (list: string[]) => new Set(list.map((label) => labels.get(label.toUpperCase())).filter((index): index is number => index !== undefined));
  const selected = useMemo(() => indicesOf(cell ? [cell] : []), [labels, cell]); // eslint-disable-line react-hooks/exhaustive-deps
  const outlined = useMemo(() => indicesOf(suggested), [labels, suggested]); // eslint-disable-line react-hooks/exhaustive-deps
  const heldCells = useMemo(() => indicesOf(held), [labels, held]); // eslint-disable-line react-hooks/exhaustive-deps
  const extent = useMemo(() => workLimitExtent(workLimit), [workLimit]);

  // A cell chosen another way (typed, or from the dive) is brought into view.
  const [flyTo, setFlyTo] = useState<{ lonLat: [number, number]; serial: number } | null>(null);
  const pickedIndex = labels.get(cell.toUpperCase());
  useEffect(() => {
    if (!data || pickedIndex === undefined) return;
    setFlyTo((current) => ({ lonLat: cellCentreLonLat(data, pickedIndex), serial: (current?.serial ?? 0) + 1 }));
  }, [data, pickedIndex]);

  return (
    <div className="space-y-1">
      <div className="relative h-72 overflow-hidden rounded border border-line sm:h-80" data-testid="find-cell-map">
        <CoverageMap
          projectId={projectId}
          lengthUnit={lengthUnit}
          data={data}
          view="status"
          layers={LAYERS}
          zoneFilter={null}
          selected={selected}
          assigned={outlined}
          held={heldCells}
          bands={null}
          flyTo={flyTo}
          onCellClick={(index, _extend, lonLat) => {
            const label = labelOf.get(index);
            if (!label || !crs) return;
            const [x, y] = crs.fromLonLat(lonLat[0], lonLat[1]);
            onPick(label, { x, y });
          }}
          onBoxSelect={() => undefined}
          onPointer={() => undefined}
          onBearing={() => undefined}
          workLimit={workLimit}
          extent={extent}
          loadError={loadError}
        />
      </div>
      <ul className="flex flex-wrap gap-x-4 gap-y-1 text-xs text-muted" aria-label="Map key">
        <li><Swatch background={MARK_SWATCHES.planned} border={MARK_STYLES.planned.line} /> {suggested.length > 0 ? "the dive's or plan's cells" : "the dive's cells (choose a dive)"}</li>
        <li><Swatch background={MARK_SWATCHES.held} border={MARK_STYLES.held.line} /> held by a stop-work hold</li>
        <li><Swatch background={MARK_SWATCHES.selected} border={MARK_STYLES.selected.line} /> the cell picked</li>
      </ul>
    </div>
  );
}

function Swatch({ background, border }: { background: string; border: string }) {
  return <span aria-hidden className="mr-1 inline-block h-3 w-4 align-middle" style={{ background, border: `2px solid ${border}` }} />;
}
