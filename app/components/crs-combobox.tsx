import { useEffect, useId, useRef, useState } from "react";
import type { LengthUnit } from "../../shared/units";

/** One CRS as GET /api/crs answers it. */
export interface CrsOption {
  crs: string;
  code: number;
  name: string;
  unit: string;
  lengthUnit: LengthUnit;
  area: string;
  matchedBy: "code" | "name" | "area";
}

/**
 * The coordinate reference system field: type an EPSG code or words of a name ("Florida East",
 * "UTM 17N") and choose from the bundled EPSG list. An ARIA 1.2 combobox: arrow keys move
 * through the list, Enter chooses, Escape closes; the field still takes a typed code as it is.
 * `onPick` lets the form follow the choice (the length unit must be the CRS's).
 */
export function CrsCombobox({ name, label, defaultValue = "", defaultDescription, error, hint, onPick }: {
  name: string;
  label: string;
  defaultValue?: string;
  /** What the default value is (its name), shown under the field. */
  defaultDescription?: string;
  error?: string;
  hint?: string;
  onPick?: (option: CrsOption) => void;
}) {
  const id = useId();
  const listId = `${id}-list`;
  const hintId = `${id}-hint`;
  const errorId = `${id}-error`;
  const statusId = `${id}-status`;
  const [value, setValue] = useState(defaultValue);
  const [options, setOptions] = useState<CrsOption[]>([]);
  const [open, setOpen] = useState(false);
  const [active, setActive] = useState(-1);
  const [chosen, setChosen] = useState<string | null>(defaultDescription ?? null);
  const [status, setStatus] = useState("");
  const typed = useRef(false);

  // Ask the server once typing pauses; a newer query cancels the older one.
  useEffect(() => {
    if (!typed.current) return;
    const query = value.trim();
    if (query.length < 2) {
      setOptions([]);
      setOpen(false);
      setStatus("");
      return;
    }
    const controller = new AbortController();
    const timer = setTimeout(async () => {
      try {
        const response = await fetch(`/api/crs?q=${encodeURIComponent(query)}&limit=12`, { signal: controller.signal, headers: { Accept: "application/json" } });
        if (!response.ok) throw new Error(String(response.status));
        const { results } = (await response.json()) as { results: CrsOption[] };
        setOptions(results);
        setOpen(true);
        setActive(-1);
        setStatus(results.length === 0 ? "No coordinate system matches." : `${results.length} coordinate system${results.length === 1 ? "" : "s"} found; use the arrow keys to choose.`);
      } catch (thrown) {
        if ((thrown as Error).name !== "AbortError") setStatus("The EPSG list could not be searched just now; type the code instead.");
      }
    }, 180);
    return () => {
      clearTimeout(timer);
      controller.abort();
    };
  }, [value]);

  const pick = (option: CrsOption) => {
    typed.current = false;
    setValue(option.crs);
    setChosen(`${option.name} (${option.unit})`);
    setOpen(false);
    setActive(-1);
    setStatus(`${option.crs} chosen: ${option.name}.`);
    onPick?.(option);
  };

  const onKeyDown = (event: React.KeyboardEvent<HTMLInputElement>) => {
    if (event.key === "ArrowDown") {
      event.preventDefault();
      if (!open && options.length > 0) setOpen(true);
      setActive((index) => (options.length === 0 ? -1 : (index + 1) % options.length));
    } else if (event.key === "ArrowUp") {
      event.preventDefault();
      setActive((index) => (options.length === 0 ? -1 : index <= 0 ? options.length - 1 : index - 1));
    } else if (event.key === "Enter" && open && active >= 0) {
      event.preventDefault();
      pick(options[active]);
    } else if (event.key === "Escape" && open) {
      event.preventDefault();
      setOpen(false);
      setActive(-1);
    }
  };

  const expanded = open && options.length > 0;
  const describedBy = [hint ? hintId : null, error ? errorId : null, chosen ? `${id}-chosen` : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className="relative">
      <label htmlFor={id} className="block text-sm font-medium">{label}</label>
      <input
        id={id} name={name} value={value} required autoComplete="off" spellCheck={false}
        role="combobox" aria-autocomplete="list" aria-expanded={expanded} aria-controls={listId}
        aria-activedescendant={expanded && active >= 0 ? `${listId}-${active}` : undefined}
        aria-invalid={error ? true : undefined} aria-describedby={describedBy}
        onChange={(event) => {
          typed.current = true;
          setChosen(null);
          setValue(event.currentTarget.value);
        }}
        onKeyDown={onKeyDown}
        onBlur={() => setOpen(false)}
        onFocus={() => { if (options.length > 0 && typed.current) setOpen(true); }}
        placeholder="EPSG code or name, e.g. Florida East"
        className="mt-1 block w-full rounded border border-line bg-panel px-3 py-2 focus:outline-2 focus:outline-offset-1 focus:outline-lagoon aria-invalid:border-danger"
      />
      <ul
        id={listId} role="listbox" aria-label="Matching coordinate systems"
        hidden={!expanded}
        className="absolute z-20 mt-1 max-h-72 w-full overflow-y-auto rounded border border-line bg-panel shadow-lg"
      >
        {options.map((option, index) => (
          <li
            key={option.code} id={`${listId}-${index}`} role="option" aria-selected={index === active}
            onMouseDown={(event) => event.preventDefault()} onClick={() => pick(option)}
            className={`cursor-pointer px-3 py-2 text-sm ${index === active ? "bg-lagoon text-white" : "hover:bg-paper"}`}
          >
            <span className="figures">{option.crs}</span> {option.name} <span className={index === active ? "" : "text-muted"}>· {option.unit}</span>
          </li>
        ))}
      </ul>
      {chosen ? <p id={`${id}-chosen`} className="mt-1 text-sm">{chosen}</p> : null}
      {hint ? <p id={hintId} className="mt-1 text-sm text-muted">{hint}</p> : null}
      {error ? <p id={errorId} className="mt-1 text-sm text-danger">{error}</p> : null}
      <p id={statusId} role="status" className="sr-only">{status}</p>
    </div>
  );
}
