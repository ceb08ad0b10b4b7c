import { UNZONED_NOTE } from "../../shared/volumes/rollup";
import { ZoneSwatch } from "./zone-swatch";

/** Figures as the trade reads them: tabular mono digits, thousands separated, unit always beside. */
const formatters = new Map<number, Intl.NumberFormat>();

function formatter(digits: number): Intl.NumberFormat {
  let format = formatters.get(digits);
  if (!format) {
    format = new Intl.NumberFormat("en-US", { minimumFractionDigits: digits, maximumFractionDigits: digits });
    formatters.set(digits, format);
  }
  return format;
}

export function formatNumber(value: number | null, digits = 0): string {
  return value === null || !Number.isFinite(value) ? "–" : formatter(digits).format(value);
}

export function Volume({ value, unit, digits = 0 }: { value: number | null; unit: string; digits?: number }) {
  return <span className="figures whitespace-nowrap">{formatNumber(value, digits)} {unit}</span>;
}

/** A zone row's name; the Unzoned row (zoneId null) is set apart so nobody takes it for a drawn zone. */
export function ZoneName({ zone }: { zone: { zoneId: number | null; name: string; colour?: string | null } }) {
  if (zone.zoneId !== null) return <>{zone.colour ? <ZoneSwatch colour={zone.colour} /> : null}{zone.name}</>;
  return <span className="italic" title={UNZONED_NOTE}>{zone.name} <span className="text-xs not-italic text-muted">(cells in no zone)</span></span>;
}

/** The React key of a zone row (the Unzoned row has no zone id). */
export const zoneKey = (zone: { zoneId: number | null }) => zone.zoneId ?? "unzoned";

export function Percent({ value, digits = 0 }: { value: number | null; digits?: number }) {
  return <span className="figures whitespace-nowrap">{value === null ? "–" : `${formatNumber(value, digits)} %`}</span>;
}
