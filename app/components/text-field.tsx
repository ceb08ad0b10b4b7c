import { useId } from "react";

interface TextFieldProps extends React.InputHTMLAttributes<HTMLInputElement> {
  label: string;
  name: string;
  error?: string | null;
  hint?: string;
}

/** A labelled input whose error and hint are tied to it with aria-describedby. */
export function TextField({ label, name, error, hint, className, ...input }: TextFieldProps) {
  const id = useId();
  const errorId = `${id}-error`;
  const hintId = `${id}-hint`;
  const describedBy = [error ? errorId : null, hint ? hintId : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className={className}>
      <label htmlFor={id} className="block text-sm font-medium">{label}</label>
      <input
        id={id}
        name={name}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        className="mt-1 block w-full rounded border border-line bg-panel px-3 py-2 focus:outline-2 focus:outline-offset-1 focus:outline-lagoon aria-invalid:border-danger"
        {...input}
      />
      {hint ? <p id={hintId} className="mt-1 text-sm text-muted">{hint}</p> : null}
      {error ? <p id={errorId} className="mt-1 text-sm text-danger">{error}</p> : null}
    </div>
  );
}
