/**
 * A zone's colour beside its name, as the map draws the zone: a dashed outline in the colour on
 * white. Decorative (the name beside it says which zone), so hidden from screen readers.
 */
export function ZoneSwatch({ colour, className = "" }: { colour: string; className?: string }) {
  return (
    <span
      aria-hidden
      data-zone-colour={colour}
      className={`mr-1.5 inline-block h-3.5 w-3.5 shrink-0 rounded-sm border-2 border-dashed bg-white align-[-2px] ${className}`}
      style={{ borderColor: colour }}
    />
  );
}
