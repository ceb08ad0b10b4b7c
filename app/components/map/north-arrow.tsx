/** A north arrow that turns with the map's bearing. */
export function NorthArrow({ bearing }: { bearing: number }) {
  return (
    <svg role="img" aria-label={`North arrow, map bearing ${Math.round(bearing)}°`} viewBox="0 0 40 56" className="h-14 w-10" style={{ transform: `rotate(${-bearing}deg)` }}>
      <polygon points="20,4 32,40 20,32 8,40" fill="#1d2528" />
      <text x="20" y="54" textAnchor="middle" fontSize="12" fontFamily="Roboto Mono, monospace">N</text>
    </svg>
  );
}
