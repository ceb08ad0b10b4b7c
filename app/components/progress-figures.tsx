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

export function Percent({ value, digits = 0 }: { value: number | null; digits?: number }) {
  return <span className="figures whitespace-nowrap">{value === null ? "–" : `${formatNumber(value, digits)} %`}</span>;
}
