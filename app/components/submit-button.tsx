import { useNavigation } from "react-router";

interface SubmitButtonProps extends React.ButtonHTMLAttributes<HTMLButtonElement> {
  pendingLabel: string;
  tone?: "primary" | "danger" | "plain";
  /** When several forms share a page, only the one whose `intent` is submitting shows pending. */
  intent?: string;
}

const tones = {
  primary: "bg-lagoon text-white hover:bg-lagoon-dark",
  danger: "bg-danger text-white hover:opacity-90",
  plain: "border border-line bg-panel hover:bg-paper",
};

/** A submit button that says what is happening while its form is being sent. */
export function SubmitButton({ pendingLabel, tone = "primary", intent, children, className = "", ...button }: SubmitButtonProps) {
  const navigation = useNavigation();
  const submitting = navigation.state === "submitting" && (intent === undefined || navigation.formData?.get("intent") === intent);
  return (
    <button
      type="submit"
      name={intent ? "intent" : button.name}
      value={intent ?? button.value}
      disabled={submitting || button.disabled}
      aria-disabled={submitting || undefined}
      className={`rounded px-4 py-2 font-medium focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-lagoon disabled:opacity-60 ${tones[tone]} ${className}`}
      {...button}
    >
      {submitting ? pendingLabel : children}
    </button>
  );
}
