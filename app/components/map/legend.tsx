import { useEffect, useState } from "react";
import type { LegendEntry } from "./paint";

export interface LegendSection {
  title: string;
  /** A line under the title: the unit, the zone shown, what the colours count. */
  note?: string;
  entries: LegendEntry[];
}

/** What the map draws, section by section (bands, cells, marked cells); empty when nothing is drawn. */
export function MapLegend({ sections, wide }: { sections: LegendSection[]; wide: boolean | null }) {
  // Open beside a wide map; folded on a phone, where it would cover the map (until opened).
  const [open, setOpen] = useState(true);
  useEffect(() => {
    if (wide === false) setOpen(false);
  }, [wide]);
  return (
    <figure aria-label="Legend" className="text-sm">
      <details open={open} onToggle={(event) => setOpen(event.currentTarget.open)}>
        <summary className="cursor-pointer select-none font-semibold focus-visible:outline-2 focus-visible:outline-lagoon">Legend</summary>
        {sections.length === 0 ? <p className="mt-1 text-muted">Nothing is drawn: turn on Cells or Bands under Map layers.</p> : null}
        {sections.map((section) => (
          <section key={section.title} aria-label={section.title} className="mt-2">
            <h3 className="font-semibold">{section.title}</h3>
            {section.note ? <p className="text-xs text-muted">{section.note}</p> : null}
            <ul className="mt-1 space-y-1">
              {section.entries.map((entry) => (
                <li key={entry.label} className="flex items-center gap-2">
                  <span
                    aria-hidden
                    className="inline-block h-4 w-6 shrink-0 rounded-sm border border-line"
                    style={{ background: entry.colour, ...(entry.outline ? { border: `2px ${entry.dashed ? "dashed" : "solid"} ${entry.outline}` } : {}) }}
                  />
                  {entry.label}
                </li>
              ))}
            </ul>
          </section>
        ))}
      </details>
    </figure>
  );
}
