import { useId, useState } from "react";
import { ZONE_COLOURS } from "../../shared/zone-colours";
import { ZoneSwatch } from "./zone-swatch";

/**
 * A zone's colour chosen from the palette (shared/zone-colours.ts: each reads on the map's land,
 * water and cells), by name, with the chosen colour shown beside the list as the map draws it.
 */
export function ZoneColourField({ label, defaultValue, error, className = "" }: { label: string; defaultValue: string; error?: string | null; className?: string }) {
  const id = useId();
  const [colour, setColour] = useState(defaultValue);
  return (
    <div className={className}>
      <label htmlFor={id} className="block text-sm font-medium">{label}</label>
      <div className="mt-1 flex items-center gap-1">
        <select
          id={id} name="colour" value={colour} onChange={(event) => setColour(event.currentTarget.value)}
          aria-invalid={error ? true : undefined} aria-describedby={error ? `${id}-error` : undefined}
          className="block rounded border border-line bg-panel px-2 py-2 focus:outline-2 focus:outline-offset-1 focus:outline-lagoon aria-invalid:border-danger"
        >
          {ZONE_COLOURS.map((option) => <option key={option.value} value={option.value}>{option.name}</option>)}
        </select>
        <ZoneSwatch colour={colour} className="ml-1 h-5 w-5" />
      </div>
      {error ? <p id={`${id}-error`} className="mt-1 text-sm text-danger">{error}</p> : null}
    </div>
  );
}
