import { dayNumber, isoDateOf } from "./calendar-days";

/**
 * Daily figures gathered into days, weeks or months for a bar chart: a long record in a narrow
 * panel (a phone) gets one bar per week or month rather than bars that overlap. Totals are kept: a
 * period's value is the sum of its days' values, or for a ratio its days' numerators over their
 * denominators (never a mean of ratios), so the bins add up to what the days add up to.
 */

export type BinSize = "day" | "week" | "month";

export interface DayFigure {
  /** YYYY-MM-DD. */
  date: string;
  /** The day's value; null: a record with nothing to draw. */
  value: number | null;
  /** For a ratio (polymer per dry ton): the parts the value is made of, which add across days. A series gives them on every day with a value, or on none. */
  ratio?: { numerator: number; denominator: number } | null;
}

export interface DayBin {
  size: BinSize;
  /** First and last calendar day of the bin (a week runs Monday to Sunday, a month from its 1st). */
  from: string;
  to: string;
  /** Sum of the days' values, or Σ numerator / Σ denominator; null when no day of it has a value. */
  value: number | null;
  /** Days of the bin with a record, and with a value. */
  recordDays: number;
  valueDays: number;
  /** For a ratio: the summed parts. */
  ratio: { numerator: number; denominator: number } | null;
}

/** The first day (day number) of the bin holding `day`. */
export function binStart(day: number, size: BinSize): number {
  if (size === "day") return day;
  if (size === "week") return day - ((day + 3) % 7); // 1970-01-01 (day 0) was a Thursday: Monday is 3 days before
  const date = isoDateOf(day);
  return dayNumber(`${date.slice(0, 8)}01`);
}

/** The first day of the bin after the one starting on `start`. */
function nextBinStart(start: number, size: BinSize): number {
  if (size === "day") return start + 1;
  if (size === "week") return start + 7;
  const date = isoDateOf(start);
  const year = Number(date.slice(0, 4));
  const month = Number(date.slice(5, 7));
  return Date.UTC(month === 12 ? year + 1 : year, month === 12 ? 0 : month, 1) / 86_400_000;
}

/** How many bins of `size` the days from `first` to `last` (day numbers) span. */
export function binCount(first: number, last: number, size: BinSize): number {
  let count = 0;
  for (let start = binStart(first, size); start <= last; start = nextBinStart(start, size)) count++;
  return count;
}

/**
 * The finest bin size whose bins are each at least `minSlotPx` wide across `widthPx`: days while
 * they fit, then weeks, then months (a month is the coarsest; past that, months are drawn anyway).
 */
export function chooseBinSize(firstDate: string, lastDate: string, widthPx: number, minSlotPx: number): BinSize {
  const first = dayNumber(firstDate);
  const last = dayNumber(lastDate);
  for (const size of ["day", "week"] as const) if (binCount(first, last, size) * minSlotPx <= widthPx) return size;
  return "month";
}

/**
 * Every bin from the one holding the first day to the one holding the last, in order, including
 * bins without a record (so gaps in the record stay gaps). `days` in any order, one per date.
 */
export function binDays(days: ReadonlyArray<DayFigure>, size: BinSize): DayBin[] {
  if (days.length === 0) return [];
  const numbers = days.map((day) => dayNumber(day.date));
  const first = Math.min(...numbers);
  const last = Math.max(...numbers);
  const bins: DayBin[] = [];
  const index = new Map<number, DayBin>();
  for (let start = binStart(first, size); start <= last; ) {
    const next = nextBinStart(start, size);
    const bin: DayBin = { size, from: isoDateOf(start), to: isoDateOf(next - 1), value: null, recordDays: 0, valueDays: 0, ratio: null };
    bins.push(bin);
    index.set(start, bin);
    start = next;
  }
  days.forEach((day, position) => {
    const bin = index.get(binStart(numbers[position], size))!;
    bin.recordDays++;
    if (day.value === null) return;
    bin.valueDays++;
    if (size === "day") {
      // A day is its own bin: its value as given.
      bin.value = day.value;
      bin.ratio = day.ratio ?? null;
    } else if (day.ratio) {
      bin.ratio = { numerator: (bin.ratio?.numerator ?? 0) + day.ratio.numerator, denominator: (bin.ratio?.denominator ?? 0) + day.ratio.denominator };
      bin.value = bin.ratio.denominator > 0 ? bin.ratio.numerator / bin.ratio.denominator : null;
    } else {
      bin.value = (bin.value ?? 0) + day.value;
    }
  });
  return bins;
}
