import { useNavigation } from "react-router";

/** A form-level message (error or success), announced to screen readers. */
export function FormMessage({ id, tone, children }: { id?: string; tone: "error" | "success"; children: React.ReactNode }) {
  if (!children) return null;
  const style = tone === "error" ? "border-danger text-danger" : "border-ok text-ok";
  return (
    <p id={id} role={tone === "error" ? "alert" : "status"} className={`rounded border bg-panel px-3 py-2 text-sm ${style}`}>
      {children}
    </p>
  );
}

/**
 * The answer to a page's last action: its form-level error, and its notice once the page is idle
 * again (a notice from the previous submission is not shown while the next one is on its way).
 */
export function ActionMessages({ error, notice }: { error?: string; notice?: string | null }) {
  const navigation = useNavigation();
  return (
    <div aria-live="polite">
      <FormMessage tone="error">{error}</FormMessage>
      <FormMessage tone="success">{navigation.state === "idle" ? notice : null}</FormMessage>
    </div>
  );
}
