/** The cell map's keys, as the handler in the map page reads them and as the panel lists them. */
export const MAP_KEYS: ReadonlyArray<{ keys: string[]; does: string }> = [
  { keys: ["←", "↑", "→", "↓"], does: "Move to the next cell and select it alone" },
  { keys: ["Shift", "+ arrow"], does: "Move and add the cell to the selection" },
  { keys: ["Space"], does: "Add or remove the current cell" },
  { keys: ["Enter"], does: "Inspect the current cell (its figures in the panel)" },
  { keys: ["A"], does: "Assign the selected cells: go to the assign form" },
  { keys: ["Esc"], does: "Clear the selection" },
  { keys: ["P"], does: "Show or hide the panel" },
  { keys: ["F"], does: "Find a cell by its label" },
  { keys: ["+", "−"], does: "Zoom in or out" },
  { keys: ["0"], does: "Frame the whole project" },
  { keys: ["W"], does: "Go to the next station or wildlife sighting and read it in the panel" },
];

/** The "Keys" disclosure in the panel. */
export function MapKeysHelp() {
  return (
    <details className="text-sm" data-testid="map-keys">
      <summary className="cursor-pointer select-none font-semibold focus-visible:outline-2 focus-visible:outline-lagoon">Keys</summary>
      <p className="mt-1 text-muted">Tab to the map (or click it), then:</p>
      <dl id="map-keys-list" className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 gap-y-1">
        {MAP_KEYS.map((entry) => (
          <div key={entry.does} className="contents">
            <dt className="whitespace-nowrap">{entry.keys.map((key) => <kbd key={key} className="mr-1 rounded border border-line bg-paper px-1 text-xs">{key}</kbd>)}</dt>
            <dd>{entry.does}</dd>
          </div>
        ))}
      </dl>
    </details>
  );
}
