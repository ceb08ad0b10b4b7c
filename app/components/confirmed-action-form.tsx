import { Form } from "react-router";
import { SubmitButton } from "./submit-button";

/**
 * A one-button form for an action that cannot be undone (revoke, remove): it asks first, naming
 * what is lost, and posts its hidden fields with the button's `intent` only if the user agrees.
 */
export function ConfirmedActionForm({
  question, intent, fields, label, pendingLabel, accessibleName, tone = "danger", className,
}: {
  /** The question asked before anything is sent, e.g. `Remove Ana from this project?`. */
  question: string;
  intent: string;
  fields: Record<string, string | number>;
  label: string;
  pendingLabel: string;
  /** The button's name for screen readers when its label alone is ambiguous (several rows). */
  accessibleName?: string;
  tone?: "danger" | "plain";
  className?: string;
}) {
  return (
    <Form method="post" onSubmit={(event) => { if (!window.confirm(question)) event.preventDefault(); }}>
      {Object.entries(fields).map(([name, value]) => <input key={name} type="hidden" name={name} value={value} />)}
      <SubmitButton intent={intent} tone={tone} pendingLabel={pendingLabel} aria-label={accessibleName} className={className}>{label}</SubmitButton>
    </Form>
  );
}
