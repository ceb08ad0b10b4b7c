import type { ReactNode } from "react";

/**
 * The map workspace's side panel: beside the map on a wide screen, a bottom sheet over it on a
 * phone. `open` null follows the screen (open beside the map, folded to its header on a phone)
 * until the user toggles it.
 */
export function MapPanel({ open, wide, onToggle, summary, children }: {
  open: boolean | null;
  /** The screen is wide enough for the panel beside the map (null before the page has run). */
  wide: boolean | null;
  onToggle: () => void;
  /** A line shown in the header, so a folded sheet still says what is selected. */
  summary: string;
  children: ReactNode;
}) {
  const shown = open ?? wide ?? true;
  const body = open === null ? "hidden lg:block" : open ? "block" : "hidden";
  return (
    <aside
      id="map-panel"
      aria-label="Map panel"
      data-testid="map-panel"
      data-open={String(shown)}
      className={`z-20 flex flex-col border-line bg-panel max-lg:fixed max-lg:inset-x-0 max-lg:bottom-0 max-lg:max-h-[70dvh] max-lg:rounded-t-xl max-lg:border-t max-lg:shadow-[0_-4px_16px_rgba(0,0,0,0.18)] lg:min-h-0 ${open === false ? "lg:absolute lg:right-0 lg:top-0 lg:rounded lg:border" : "lg:w-[25rem] lg:shrink-0 lg:border-l"}`}
    >
      <div className={`flex items-center gap-2 border-line px-3 py-2 ${open === false ? "max-lg:border-b lg:p-1" : "border-b"}`}>
        <span aria-hidden className="mx-auto mb-1 block h-1 w-10 rounded bg-line lg:hidden max-lg:absolute max-lg:left-1/2 max-lg:top-1 max-lg:-translate-x-1/2" />
        <p className={`min-w-0 flex-1 truncate text-sm ${open === false ? "lg:hidden" : ""}`} data-testid="panel-summary">{summary}</p>
        <button
          type="button"
          onClick={onToggle}
          aria-expanded={shown}
          aria-controls="map-panel-body"
          className="shrink-0 rounded border border-line px-2 py-1 text-sm hover:bg-paper focus-visible:outline-2 focus-visible:outline-lagoon"
        >
          {shown ? "Hide panel" : "Show panel"}
          <kbd className="ml-1 hidden rounded border border-line px-1 text-xs text-muted lg:inline">P</kbd>
        </button>
      </div>
      <div id="map-panel-body" className={`${body} min-h-0 flex-1 space-y-4 overflow-y-auto overscroll-contain p-3`}>
        {children}
      </div>
    </aside>
  );
}
