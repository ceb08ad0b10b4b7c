import { data, isRouteErrorResponse } from "react-router";
import { PercentLegend, ProgressOutlineMap } from "~/components/progress-outline-map";
import { ZoneSwatch } from "~/components/zone-swatch";
import { clientAddress } from "~/lib/http/client-address.server";
import { PUBLIC_CACHE_SECONDS, publicProgressForToken, publicRateLimit } from "~/models/share-links.server";
import type { Route } from "./+types/share.$token";

// The public progress page of a share link: no sign-in, read-only, built only from the
// allow-listed PublicProgressView. It is the one page that other sites may frame (embed snippet on
// the project's Share page); every other page is sent with framing refused.

const noStore = { "Cache-Control": "no-store" };

export async function loader({ request, params }: Route.LoaderArgs) {
  const retryAfter = publicRateLimit(clientAddress(request));
  if (retryAfter !== null) {
    throw data("Too many requests for public progress pages. Try again shortly.", { status: 429, headers: { ...noStore, "Retry-After": String(retryAfter) } });
  }
  const view = await publicProgressForToken(params.token);
  if (!view) throw data("This progress link does not exist or was withdrawn.", { status: 404, headers: noStore });
  // The root layout still reads the session: a signed-in visitor's copy names them, so only a
  // cookie-less request may be stored by shared caches (proxies, CDNs).
  const shared = !request.headers.get("Cookie");
  return data(view, {
    headers: {
      "Cache-Control": `${shared ? "public" : "private"}, max-age=${PUBLIC_CACHE_SECONDS}`,
      Vary: "Cookie",
      "Content-Security-Policy": "frame-ancestors *",
      "Referrer-Policy": "no-referrer",
      "X-Robots-Tag": "noindex",
    },
  });
}

export function headers({ loaderHeaders, errorHeaders }: Route.HeadersArgs) {
  return errorHeaders ?? loaderHeaders;
}

const number = new Intl.NumberFormat("en-US", { maximumFractionDigits: 0 });

export default function SharePage({ loaderData: view }: Route.ComponentProps) {
  return (
    <main className="mx-auto max-w-3xl px-4 py-4 sm:px-6">
      {/* The site's own header and sign-in link mean nothing to a public or embedded reader. */}
      <style>{"body > header { display: none; }"}</style>
      <h1 className="text-xl font-semibold text-lagoon-dark sm:text-2xl">{view.projectName}</h1>
      <p className="text-sm text-muted">Restoration progress</p>
      <dl className="mt-4 grid grid-cols-2 gap-3 sm:grid-cols-3">
        <div className="rounded border border-line bg-panel p-3">
          <dt className="text-xs text-muted">Complete</dt>
          <dd className="figures text-2xl">{view.percentComplete === null ? "–" : `${view.percentComplete} %`}</dd>
        </div>
        <div className="rounded border border-line bg-panel p-3">
          <dt className="text-xs text-muted">Sediment removed</dt>
          <dd className="figures text-2xl">{number.format(view.removedVolume)} {view.volumeLabel}</dd>
        </div>
        <div className="col-span-2 rounded border border-line bg-panel p-3 sm:col-span-1">
          <dt className="text-xs text-muted">Last updated</dt>
          <dd className="figures text-2xl">{view.lastUpdated ? <time dateTime={view.lastUpdated}>{view.lastUpdated}</time> : "–"}</dd>
        </div>
      </dl>
      {view.nutrientsRemoved ? (
        <p className="mt-3 text-sm" data-testid="public-nutrients">
          Nutrients taken out of the water with the sediment: <span className="figures font-semibold">{number.format(view.nutrientsRemoved.phosphorus)} {view.nutrientsRemoved.label}</span> of phosphorus
          and <span className="figures font-semibold">{number.format(view.nutrientsRemoved.nitrogen)} {view.nutrientsRemoved.label}</span> of nitrogen (estimated from surveys and lab samples).
        </p>
      ) : null}
      {view.publicText ? <p className="mt-4 whitespace-pre-line">{view.publicText}</p> : null}
      <figure className="mt-4 rounded border border-line bg-panel p-2">
        <ProgressOutlineMap
          workLimit={view.workLimit} shoreline={view.shoreline} zones={view.zones.filter((zone) => !zone.unzoned)}
          // A cubic-metre project measures in metres; a cubic-yard one in feet.
          scaleUnit={view.volumeLabel === "m³" ? "m" : "ft"}
          title={`Map of ${view.projectName}: ${view.shoreline.length > 0 ? "the shoreline, " : ""}the work limit and its zones coloured by percent complete, north up`}
        />
        <figcaption className="mt-2"><PercentLegend shoreline={view.shoreline.length > 0} /></figcaption>
      </figure>
      <h2 className="mt-4 font-semibold">Zones</h2>
      <ul className="mt-2 grid gap-2" aria-label="Zones">
        {view.zones.map((zone) => (
          <li key={zone.unzoned ? "unzoned" : zone.name} className="rounded border border-line bg-panel p-2" data-unzoned={zone.unzoned ? "" : undefined}>
            <div className="flex justify-between gap-2">
              {zone.unzoned ? <span className="italic">{zone.name} <span className="text-xs not-italic text-muted">(parts of the work area in no zone)</span></span> : <span>{zone.colour ? <ZoneSwatch colour={zone.colour} /> : null}{zone.name}</span>}
              <span className="figures">{zone.percentComplete === null ? "–" : `${zone.percentComplete} %`}</span></div>
            <div className="mt-1 h-2 rounded bg-paper" aria-hidden="true"><div className="h-2 rounded bg-lagoon" style={{ width: `${zone.percentComplete ?? 0}%` }} /></div>
          </li>
        ))}
      </ul>
      <p className="mt-4 text-xs text-muted">Percent complete is the share of the planned sediment volume no longer above firm sand, from the latest surveys. Published with Firmsand.</p>
    </main>
  );
}

export function meta({ data: view }: Route.MetaArgs) {
  return [
    { title: view ? `${view.projectName} · progress` : "Progress · Firmsand" },
    { name: "robots", content: "noindex" },
  ];
}

/** A plain page for a withdrawn or unknown link (no site navigation: it may be inside an iframe). */
export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  const status = isRouteErrorResponse(error) ? error.status : 500;
  const message = status === 404 ? "This progress link does not exist or was withdrawn." : status === 429 ? "Too many requests just now. Please try again in a minute." : "The progress page could not be shown.";
  return (
    <main className="mx-auto max-w-3xl px-4 py-8">
      <style>{"body > header { display: none; }"}</style>
      <h1 className="text-xl font-semibold">{status === 404 ? "Link not found" : "Progress unavailable"}</h1>
      <p className="mt-2">{message}</p>
    </main>
  );
}
