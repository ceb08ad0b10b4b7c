import type { LegendEntry } from "./paint";

export function MapLegend({ title, entries }: { title: string; entries: LegendEntry[] }) {
  return (
    <figure aria-label="Legend" className="rounded border border-line bg-panel p-3 text-sm">
      <figcaption className="font-semibold">{title}</figcaption>
      <ul className="mt-2 space-y-1">
        {entries.map((entry) => (
          <li key={entry.label} className="flex items-center gap-2">
            <span aria-hidden className="inline-block h-4 w-6 rounded-sm border border-line" style={{ background: entry.colour }} />
            {entry.label}
          </li>
        ))}
      </ul>
    </figure>
  );
}
