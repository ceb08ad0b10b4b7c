import { useEffect, useRef, useState } from "react";

type CopyState = "idle" | "copied" | "failed";

/**
 * Copies `text` with the clipboard API; where that is missing or refused (plain http from another
 * host, an older browser) it falls back to selecting the text in a hidden field and the browser's
 * copy command. The button says "Copied" for a few seconds, and a live region tells a screen reader.
 */
async function copyText(text: string): Promise<boolean> {
  try {
    if (navigator.clipboard && window.isSecureContext) {
      await navigator.clipboard.writeText(text);
      return true;
    }
  } catch {
    // refused (no permission, no focus): try the fallback below
  }
  const field = document.createElement("textarea");
  field.value = text;
  field.setAttribute("readonly", "");
  field.style.position = "fixed";
  field.style.opacity = "0";
  document.body.appendChild(field);
  field.select();
  try {
    return document.execCommand("copy");
  } catch {
    return false;
  } finally {
    field.remove();
  }
}

export function CopyButton({ text, label, className = "" }: { text: string; label: string; className?: string }) {
  const [state, setState] = useState<CopyState>("idle");
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);
  useEffect(() => () => { if (timer.current) clearTimeout(timer.current); }, []);
  async function copy() {
    const copied = await copyText(text);
    setState(copied ? "copied" : "failed");
    if (timer.current) clearTimeout(timer.current);
    timer.current = setTimeout(() => setState("idle"), 4000);
  }
  return (
    <span className={`inline-flex items-center gap-2 ${className}`}>
      <button
        type="button"
        onClick={copy}
        aria-label={state === "copied" ? `${label}: copied` : label}
        className={`rounded border px-3 py-1 text-sm focus-visible:outline-2 focus-visible:outline-lagoon ${state === "copied" ? "border-ok text-ok" : "border-line bg-panel hover:bg-paper"}`}
      >
        {state === "copied" ? "Copied ✓" : "Copy"}
      </button>
      <span role="status" className="text-sm">
        {state === "failed" ? <span className="text-danger">Could not copy: select the text and copy it by hand.</span> : null}
      </span>
    </span>
  );
}
