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
