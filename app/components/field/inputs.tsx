import { useId } from "react";

/**
 * Inputs for the field page: large (48 px and more) for wet or gloved hands, a label above each,
 * the error and hint tied to the input with aria-describedby.
 */

const inputClass =
  "mt-1 block min-h-12 w-full rounded border-2 border-line bg-panel px-3 py-2 text-lg focus:outline-3 focus:outline-offset-1 focus:outline-lagoon aria-invalid:border-danger";

interface Described {
  label: string;
  error?: string;
  hint?: string;
}

function useDescribed(error?: string, hint?: string) {
  const id = useId();
  const describedBy = [error ? `${id}-error` : null, hint ? `${id}-hint` : null].filter(Boolean).join(" ") || undefined;
  return { id, describedBy };
}

function Notes({ id, error, hint }: { id: string; error?: string; hint?: string }) {
  return (
    <>
      {hint ? <p id={`${id}-hint`} className="mt-1 text-sm text-muted">{hint}</p> : null}
      {error ? <p id={`${id}-error`} className="mt-1 font-medium text-danger">{error}</p> : null}
    </>
  );
}

export function BigInput({ label, error, hint, ...input }: Described & React.InputHTMLAttributes<HTMLInputElement> & { name: string }) {
  const { id, describedBy } = useDescribed(error, hint);
  return (
    <div>
      <label htmlFor={id} className="block font-medium">{label}</label>
      <input id={id} aria-invalid={error ? true : undefined} aria-describedby={describedBy} className={inputClass} {...input} />
      <Notes id={id} error={error} hint={hint} />
    </div>
  );
}

export function BigTextArea({ label, error, hint, ...input }: Described & React.TextareaHTMLAttributes<HTMLTextAreaElement> & { name: string }) {
  const { id, describedBy } = useDescribed(error, hint);
  return (
    <div>
      <label htmlFor={id} className="block font-medium">{label}</label>
      <textarea id={id} rows={3} aria-invalid={error ? true : undefined} aria-describedby={describedBy} className={inputClass} {...input} />
      <Notes id={id} error={error} hint={hint} />
    </div>
  );
}

export function BigSelect({ label, error, hint, options, placeholder, ...select }: Described & React.SelectHTMLAttributes<HTMLSelectElement> & { name: string; options: Array<{ value: string; label: string }>; placeholder?: string }) {
  const { id, describedBy } = useDescribed(error, hint);
  return (
    <div>
      <label htmlFor={id} className="block font-medium">{label}</label>
      <select id={id} aria-invalid={error ? true : undefined} aria-describedby={describedBy} className={inputClass} {...select}>
        {placeholder !== undefined ? <option value="">{placeholder}</option> : null}
        {options.map((option) => <option key={option.value} value={option.value}>{option.label}</option>)}
      </select>
      <Notes id={id} error={error} hint={hint} />
    </div>
  );
}

export function BigCheckbox({ label, hint, ...input }: { label: string; hint?: string } & React.InputHTMLAttributes<HTMLInputElement> & { name: string }) {
  const { id, describedBy } = useDescribed(undefined, hint);
  return (
    <div>
      <label htmlFor={id} className="flex min-h-12 items-center gap-3 font-medium">
        <input id={id} type="checkbox" aria-describedby={describedBy} className="size-6 accent-lagoon" {...input} />
        {label}
      </label>
      <Notes id={id} hint={hint} />
    </div>
  );
}

export const bigButton = {
  primary: "min-h-12 rounded bg-lagoon px-5 py-3 text-lg font-medium text-white hover:bg-lagoon-dark focus-visible:outline-3 focus-visible:outline-offset-2 focus-visible:outline-lagoon disabled:opacity-60",
  plain: "min-h-12 rounded border-2 border-line bg-panel px-4 py-2 font-medium hover:bg-paper focus-visible:outline-3 focus-visible:outline-offset-2 focus-visible:outline-lagoon disabled:opacity-60",
  danger: "min-h-12 rounded bg-danger px-4 py-2 font-medium text-white hover:opacity-90 focus-visible:outline-3 focus-visible:outline-offset-2 focus-visible:outline-lagoon",
};
