import { useEffect, useRef } from "react";
import { Link, useLocation } from "react-router";
import { SignOutForm } from "./sign-out-form";

interface MenuUser {
  id: number;
  name: string;
  email: string;
  isSiteAdmin: boolean;
}

const linkClass = "underline-offset-2 hover:underline focus-visible:outline-2 focus-visible:outline-lagoon";

/**
 * The signed-in person's links in the site header. From 640 px they sit in a row; on a phone they
 * fold into a "Menu" disclosure, so a long name or the admin's extra link never squeezes "Sign out"
 * onto two lines. The disclosure is a <details>, so it opens without scripts and by keyboard; it
 * closes on the next page, on Escape (focus back on its button) and on a press outside it.
 */
export function SiteMenu({ user }: { user: MenuUser }) {
  const details = useRef<HTMLDetailsElement>(null);
  const location = useLocation();

  useEffect(() => {
    if (details.current) details.current.open = false;
  }, [location.key]);

  useEffect(() => {
    const element = details.current;
    if (!element) return;
    const closeOutside = (event: PointerEvent) => {
      if (element.open && !element.contains(event.target as Node)) element.open = false;
    };
    document.addEventListener("pointerdown", closeOutside);
    return () => document.removeEventListener("pointerdown", closeOutside);
  }, []);

  function onKeyDown(event: React.KeyboardEvent<HTMLDetailsElement>) {
    if (event.key !== "Escape" || !details.current?.open) return;
    // An open sign-out question handles its own Escape first.
    if ((event.target as HTMLElement).closest("[role=alertdialog]")) return;
    details.current.open = false;
    details.current.querySelector("summary")?.focus();
  }

  return (
    <>
      <nav aria-label="Account" className="ml-auto hidden min-w-0 items-center gap-4 text-sm sm:flex">
        <Link className={linkClass} to="/projects">Projects</Link>
        {user.isSiteAdmin ? <Link className={linkClass} to="/admin/users">Accounts</Link> : null}
        <Link className={`min-w-0 truncate ${linkClass}`} to="/account" title={user.name}>{user.name}</Link>
        {/* Asks first when field entries wait on this device, and clears them from it. */}
        <SignOutForm userId={user.id} />
      </nav>
      <details ref={details} className="relative ml-auto text-sm sm:hidden" onKeyDown={onKeyDown} data-testid="site-menu">
        <summary className="flex min-h-11 cursor-pointer list-none items-center gap-2 rounded border border-line px-3 py-1 hover:bg-paper focus-visible:outline-2 focus-visible:outline-lagoon [&::-webkit-details-marker]:hidden">
          <svg aria-hidden="true" width="16" height="16" viewBox="0 0 16 16" className="shrink-0"><path d="M2 4h12M2 8h12M2 12h12" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" /></svg>
          Menu
        </summary>
        <nav aria-label="Account" className="absolute right-0 z-40 mt-2 flex w-64 max-w-[calc(100vw-2rem)] flex-col gap-1 rounded border border-line bg-panel p-2 text-base shadow-lg">
          <p className="truncate px-2 py-1 text-sm text-muted" title={user.email}>Signed in as {user.name}</p>
          <Link className={`flex min-h-11 items-center rounded px-2 hover:bg-paper ${linkClass}`} to="/projects">Projects</Link>
          {user.isSiteAdmin ? <Link className={`flex min-h-11 items-center rounded px-2 hover:bg-paper ${linkClass}`} to="/admin/users">Accounts</Link> : null}
          <Link className={`flex min-h-11 items-center rounded px-2 hover:bg-paper ${linkClass}`} to="/account">Your account</Link>
          <div className="border-t border-line px-2 pt-2">
            <SignOutForm userId={user.id} />
          </div>
        </nav>
      </details>
    </>
  );
}
