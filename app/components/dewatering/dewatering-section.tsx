import { NavLink } from "react-router";

/** The Dewatering section's own tabs: shift log, jar tests, tubes, hauls, samples. */
export function DewateringNav({ projectId }: { projectId: number }) {
  const base = `/projects/${projectId}/dewatering`;
  const linkClass = ({ isActive }: { isActive: boolean }) =>
    `rounded px-3 py-2 text-sm focus-visible:outline-2 focus-visible:outline-lagoon ${isActive ? "border border-lagoon text-lagoon-dark font-medium" : "border border-transparent hover:bg-panel"}`;
  return (
    <nav aria-label="Dewatering" className="flex flex-wrap gap-1">
      <NavLink end to={base} className={linkClass}>Shift log</NavLink>
      <NavLink to={`${base}/jar-tests`} className={linkClass}>Jar tests</NavLink>
      <NavLink to={`${base}/tubes`} className={linkClass}>Tubes</NavLink>
      <NavLink to={`${base}/hauls`} className={linkClass}>Hauls</NavLink>
      <NavLink to={`${base}/samples`} className={linkClass}>Sediment samples</NavLink>
    </nav>
  );
}

/** The section's safety note: shown wherever dewatering work is recorded. */
export function DewateringCaution({ text }: { text: string }) {
  return (
    <p role="note" className="rounded border border-caution bg-[#fff7e8] p-3 text-sm text-caution" data-testid="dewatering-caution">
      <strong>Caution.</strong> {text}
    </p>
  );
}

/** One computed figure with its unit and, beside it, the formula it came from. */
export function ComputedFigure({ term, value, unit, formula, testId }: { term: string; value: string; unit: string; formula: string; testId?: string }) {
  return (
    <div className="border-t border-line py-2">
      <dt className="text-sm text-muted">{term}</dt>
      <dd className="flex flex-wrap items-baseline justify-between gap-x-3">
        <span className="figures text-lg font-medium" data-testid={testId}>{value} <span className="text-sm">{unit}</span></span>
        <span className="text-xs text-muted">{formula}</span>
      </dd>
    </div>
  );
}

const inputClass = "mt-1 block w-full rounded border border-line bg-panel px-3 py-3 text-base focus:outline-2 focus:outline-offset-1 focus:outline-lagoon aria-invalid:border-danger";

/** A large labelled input for a phone in a gloved hand; the error sits under it. */
/** `idPrefix` keeps ids unique where one form repeats per row. */
export function FieldInput({ label, name, error, hint, className, idPrefix = "field", ...input }: React.InputHTMLAttributes<HTMLInputElement> & { label: string; name: string; error?: string; hint?: string; idPrefix?: string }) {
  const id = `${idPrefix}-${name}`;
  return (
    <div className={className}>
      <label htmlFor={id} className="block text-sm font-medium">{label}</label>
      <input id={id} name={name} aria-invalid={error ? true : undefined} aria-describedby={error ? `${id}-error` : hint ? `${id}-hint` : undefined} className={inputClass} {...input} />
      {hint ? <p id={`${id}-hint`} className="mt-1 text-xs text-muted">{hint}</p> : null}
      {error ? <p id={`${id}-error`} className="mt-1 text-sm text-danger">{error}</p> : null}
    </div>
  );
}

export function FieldSelect({ label, name, error, children, className, ...select }: React.SelectHTMLAttributes<HTMLSelectElement> & { label: string; name: string; error?: string }) {
  const id = `field-${name}`;
  return (
    <div className={className}>
      <label htmlFor={id} className="block text-sm font-medium">{label}</label>
      <select id={id} name={name} aria-invalid={error ? true : undefined} aria-describedby={error ? `${id}-error` : undefined} className={inputClass} {...select}>{children}</select>
      {error ? <p id={`${id}-error`} className="mt-1 text-sm text-danger">{error}</p> : null}
    </div>
  );
}

// One formatter per number of decimals: `toLocaleString` with options builds a new one per call,
// a visible share of the overview's render time (its reconciliation panel formats dozens).
const figureFormats = new Map<number, Intl.NumberFormat>();

/** A number for a table or a figure, at most `digits` decimals. */
export function formatFigure(value: number | null | undefined, digits = 1): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return "–";
  let format = figureFormats.get(digits);
  if (!format) figureFormats.set(digits, (format = new Intl.NumberFormat("en-US", { maximumFractionDigits: digits, minimumFractionDigits: 0 })));
  return format.format(value);
}
