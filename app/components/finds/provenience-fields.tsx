import { useState } from "react";
import { TextField } from "~/components/text-field";
import { CellPickerMap } from "./cell-picker";
import type { FindFormOptions } from "~/models/finds.server";

const inputClass = "mt-1 block w-full rounded border border-line bg-panel px-3 py-2 focus:outline-2 focus:outline-offset-1 focus:outline-lagoon";

/**
 * Where something came up and from which dive and team, for the find forms: dive and team (a dive
 * names its team and its cells), the small map where a tap picks the cell (and, when asked, the
 * position), the cell field, and the position as easting and northing or latitude and longitude.
 */
/** `tagLabel`: what the field tag is called on this form (a find's tag, a basket's). */
export function ProvenienceFields({ options, errors, tagLabel }: { options: Pick<FindFormOptions, "projectId" | "lengthUnit" | "lengthLabel" | "crsCode" | "workLimit" | "dives" | "teams" | "cells" | "heldCells" | "prefill">; errors: Record<string, string>; tagLabel: string }) {
  const { lengthLabel, dives, teams, prefill } = options;
  const [cell, setCell] = useState(prefill.cells[0] ?? "");
  const [diveId, setDiveId] = useState(prefill.diveId === null ? "" : String(prefill.diveId));
  const [teamId, setTeamId] = useState(prefill.teamId === null ? "" : String(prefill.teamId));
  const [planCells] = useState(prefill.diveId === null ? prefill.cells : []);
  const [positionIn, setPositionIn] = useState<"grid" | "latlon">("grid");
  const [tapSetsPosition, setTapSetsPosition] = useState(false);
  const [easting, setEasting] = useState("");
  const [northing, setNorthing] = useState("");
  const dive = dives.find((candidate) => String(candidate.id) === diveId) ?? null;
  const suggested = dive ? dive.cells : planCells;
  return (
    <>
        <div className="grid gap-3 sm:grid-cols-2">
          <div>
            <label htmlFor="diveId" className="block text-sm font-medium">Dive</label>
            <select
              id="diveId" name="diveId" className={inputClass} value={diveId}
              onChange={(event) => {
                setDiveId(event.target.value);
                const chosen = dives.find((candidate) => String(candidate.id) === event.target.value);
                if (chosen?.teamId) setTeamId(String(chosen.teamId));
                if (chosen && chosen.cells.length > 0 && !cell) setCell(chosen.cells[0]);
              }}
              aria-invalid={errors.diveId ? true : undefined}
            >
              <option value="">Not from a logged dive</option>
              {dives.map((candidate) => <option key={candidate.id} value={candidate.id}>{candidate.label}</option>)}
            </select>
            {errors.diveId ? <p className="mt-1 text-sm text-danger">{errors.diveId}</p> : null}
          </div>
          <div>
            <label htmlFor="teamId" className="block text-sm font-medium">Team</label>
            <select id="teamId" name="teamId" className={inputClass} value={teamId} onChange={(event) => setTeamId(event.target.value)} aria-invalid={errors.teamId ? true : undefined} aria-describedby="team-hint">
              <option value="">No team named</option>
              {teams.map((team) => <option key={team.id} value={team.id}>{team.name}</option>)}
            </select>
            <p id="team-hint" className="mt-1 text-xs text-muted">A dive names its own team.</p>
            {errors.teamId ? <p className="mt-1 text-sm text-danger">{errors.teamId}</p> : null}
          </div>
        </div>
        <fieldset className="space-y-2">
          <legend className="text-sm font-medium">Where it came up</legend>
          <CellPickerMap
            projectId={options.projectId} lengthUnit={options.lengthUnit} workLimit={options.workLimit}
            cell={cell} suggested={suggested} held={options.heldCells}
            onPick={(label, position) => {
              setCell(label);
              if (!tapSetsPosition) return;
              setPositionIn("grid");
              setEasting(position.x.toFixed(2));
              setNorthing(position.y.toFixed(2));
            }}
          />
          <label className="flex items-center gap-2 text-sm">
            <input type="checkbox" checked={tapSetsPosition} onChange={(event) => setTapSetsPosition(event.target.checked)} />
            A tap also sets the position (where the diver marked it, not where the boat was)
          </label>
          <div>
            <label htmlFor="cell" className="block text-sm font-medium">Cell</label>
            <input id="cell" name="cell" list="cells-inside" value={cell} onChange={(event) => setCell(event.target.value.toUpperCase())} maxLength={16} autoCapitalize="characters" className={inputClass} aria-invalid={errors.cell ? true : undefined} aria-describedby="cell-hint" />
            <datalist id="cells-inside">{options.cells.map((label) => <option key={label} value={label} />)}</datalist>
            <p id="cell-hint" className="mt-1 text-sm text-muted">Tap it on the map or type it; it defaults from the dive's cells.</p>
            {errors.cell ? <p className="mt-1 text-sm text-danger">{errors.cell}</p> : null}
          </div>
          <fieldset className="flex flex-wrap gap-x-4 gap-y-1 text-sm">
            <legend className="font-medium">Position (optional), given as</legend>
            <label className="flex items-center gap-1"><input type="radio" name="positionIn" value="grid" checked={positionIn === "grid"} onChange={() => setPositionIn("grid")} /> easting and northing ({options.crsCode})</label>
            <label className="flex items-center gap-1"><input type="radio" name="positionIn" value="latlon" checked={positionIn === "latlon"} onChange={() => setPositionIn("latlon")} /> latitude and longitude (WGS 84)</label>
          </fieldset>
          {positionIn === "grid" ? (
            <div className="grid grid-cols-2 gap-3">
              <TextField label={`Easting (${lengthLabel})`} name="easting" inputMode="decimal" value={easting} onChange={(event) => setEasting(event.target.value)} error={errors.easting} />
              <TextField label={`Northing (${lengthLabel})`} name="northing" inputMode="decimal" value={northing} onChange={(event) => setNorthing(event.target.value)} error={errors.northing} />
            </div>
          ) : (
            <div className="grid grid-cols-2 gap-3">
              <TextField label="Latitude (°)" name="latitude" inputMode="decimal" placeholder="29.18342" error={errors.latitude} />
              <TextField label="Longitude (°)" name="longitude" inputMode="decimal" placeholder="-82.08761" error={errors.longitude} />
            </div>
          )}
          <p className="text-xs text-muted">A position must lie inside the work limit and in the cell named.</p>
        </fieldset>
        <div className="grid grid-cols-2 gap-3">
          <TextField label={`Depth below surface (${lengthLabel})`} name="depthBelowSurface" type="number" inputMode="decimal" step="0.1" min={0} error={errors.depthBelowSurface} />
          <TextField label={`Depth within the muck (${lengthLabel})`} name="depthInMuck" type="number" inputMode="decimal" step="0.1" min={0} error={errors.depthInMuck} />
        </div>
        <div className="grid grid-cols-2 gap-3">
          <TextField label="Finder" name="finder" maxLength={120} error={errors.finder} />
          <TextField label={tagLabel} name="fieldTag" maxLength={60} error={errors.fieldTag} />
        </div>
    </>
  );
}
