import { readFileSync } from "node:fs";
import { join } from "node:path";
import { request as playwrightRequest, type APIRequestContext, type APIResponse } from "@playwright/test";
import { configuredRoutes } from "../configured-routes";
import { cellLabel } from "../../shared/grid/cell-grid";
import { DEMO_ACCOUNTS, demoProjectId, expect, signInRequest, test, type DemoAccount } from "./fixtures";

// Who may do what, route by route: every route in app/routes.ts, each method it answers, for each
// demo account and signed out, against the matrix below. The matrix is written out by hand (not
// derived from app/lib/permissions.ts), so a wrong entry in the permission table fails here.
//
// Mutating requests carry a body that is invalid or name an id that does not exist: a role that
// is allowed gets the 4xx of that body (or a 404), never 401/403, and nothing changes; a refused
// role gets 403 before its body is looked at. Later issues add their routes as rows here.
//
// Cells: a status code, "login" (a 302 to /login?next=<this URL>, pages when signed out) or
// "302 <path>" (any other redirect). Columns, in order:
const COLUMNS = ["manager", "surveyor", "dive-supervisor", "dewatering", "resource-monitor", "outreach", "viewer", "admin", "signed-out"] as const;
type Column = (typeof COLUMNS)[number];

type Body = { form: Record<string, string> } | { json: unknown };
interface Row {
  method: "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
  /** The route's path exactly as app/routes.ts has it (nested paths joined, "" for the home page). */
  route: string;
  /** The URL asked for: {project}, {survey} and {cell} are the demo project's. */
  url: string;
  expected: string;
  body?: Body;
}
const row = (method: Row["method"], route: string, url: string, expected: string, body?: Body): Row => ({ method, route, url, expected, body });

// A JSON body every API route refuses (required fields missing) and form bodies no page accepts.
const EMPTY_JSON: Body = { json: {} };
const BOGUS_INTENT: Body = { form: { intent: "no-such-intent" } };
const PLAN_DATE = "2030-01-02";

const MATRIX: Row[] = [
  //                                                                                              manager surveyor dive-sup dewater monitor outreach viewer admin signed-out
  row("GET", "", "/", "200 200 200 200 200 200 200 200 200"),
  row("GET", "account", "/account", "200 200 200 200 200 200 200 200 login"),
  row("POST", "account", "/account", "400 400 400 400 400 400 400 400 login", BOGUS_INTENT),
  row("GET", "admin/users", "/admin/users", "403 403 403 403 403 403 403 200 login"),
  row("POST", "admin/users", "/admin/users", "403 403 403 403 403 403 403 400 login", BOGUS_INTENT),

  // The API: JSON 401 when signed out, never a redirect.
  row("GET", "api/*", "/api/no-such-thing", "404 404 404 404 404 404 404 404 401"),
  row("POST", "api/*", "/api/no-such-thing", "404 404 404 404 404 404 404 404 401", EMPTY_JSON),
  row("PUT", "api/*", "/api/no-such-thing", "404 404 404 404 404 404 404 404 401", EMPTY_JSON),
  row("PATCH", "api/*", "/api/no-such-thing", "404 404 404 404 404 404 404 404 401", EMPTY_JSON),
  row("DELETE", "api/*", "/api/no-such-thing", "404 404 404 404 404 404 404 404 401"),
  // Accounts: the site admin only ({} names no change: 422 before the id is looked up).
  row("GET", "api/admin/users", "/api/admin/users", "403 403 403 403 403 403 403 200 401"),
  row("PATCH", "api/admin/users/:userId", "/api/admin/users/999999999", "403 403 403 403 403 403 403 422 401", EMPTY_JSON),
  // The EPSG search of the CRS fields: anyone signed in.
  row("GET", "api/crs", "/api/crs?q=florida%20east", "200 200 200 200 200 200 200 200 401"),
  // Creating a project: a site admin (or a user allowed to); none of the demo's other accounts is.
  row("POST", "api/projects", "/api/projects", "403 403 403 403 403 403 403 422 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId", "/api/projects/{project}", "200 403 403 403 403 403 403 200 401"),
  row("PATCH", "api/projects/:projectId", "/api/projects/{project}", "422 403 403 403 403 403 403 422 401", EMPTY_JSON),
  // Archiving (the manager; no body) is only tried on a project that does not exist here: the demo must stay open.
  row("POST", "api/projects/:projectId/archive", "/api/projects/999999999/archive", "404 404 404 404 404 404 404 404 401"),
  row("GET", "api/projects/:projectId/assignments", `/api/projects/{project}/assignments?date=${PLAN_DATE}`, "200 200 200 200 200 200 200 200 401"),
  row("POST", "api/projects/:projectId/assignments", "/api/projects/{project}/assignments", "422 403 422 403 403 403 403 422 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/bands", "/api/projects/{project}/bands?surface=remaining", "200 200 200 200 200 200 200 200 401"),
  row("GET", "api/projects/:projectId/cells", "/api/projects/{project}/cells", "200 200 200 200 200 200 200 200 401"),
  row("GET", "api/projects/:projectId/cells/:label", "/api/projects/{project}/cells/{cell}", "200 200 200 200 200 200 200 200 401"),
  row("GET", "api/projects/:projectId/dewatering/jar-tests", "/api/projects/{project}/dewatering/jar-tests", "200 200 200 200 200 200 200 200 401"),
  row("POST", "api/projects/:projectId/dewatering/jar-tests", "/api/projects/{project}/dewatering/jar-tests", "422 403 403 422 403 403 403 422 401", EMPTY_JSON),
  // A JSON body where the photo upload takes multipart: 415 for those who may add photos.
  row("GET", "api/projects/:projectId/dewatering/jar-tests/:jarTestId", "/api/projects/{project}/dewatering/jar-tests/999999999", "404 404 404 404 404 404 404 404 401"),
  row("POST", "api/projects/:projectId/dewatering/jar-tests/:jarTestId/photos", "/api/projects/{project}/dewatering/jar-tests/999999999/photos", "415 403 403 415 403 403 403 415 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/dewatering/jar-tests/:jarTestId/photos/:photoId", "/api/projects/{project}/dewatering/jar-tests/999999999/photos/999999999", "404 404 404 404 404 404 404 404 401"),
  row("GET", "api/projects/:projectId/dewatering/shifts", "/api/projects/{project}/dewatering/shifts", "200 200 200 200 200 200 200 200 401"),
  row("POST", "api/projects/:projectId/dewatering/shifts", "/api/projects/{project}/dewatering/shifts", "422 403 403 422 403 403 403 422 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/dewatering/tubes", "/api/projects/{project}/dewatering/tubes", "200 200 200 200 200 200 200 200 401"),
  row("POST", "api/projects/:projectId/dewatering/tubes", "/api/projects/{project}/dewatering/tubes", "422 403 403 422 403 403 403 422 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/dewatering/tubes/:tubeId", "/api/projects/{project}/dewatering/tubes/999999999", "404 404 404 404 404 404 404 404 401"),
  row("PATCH", "api/projects/:projectId/dewatering/tubes/:tubeId", "/api/projects/{project}/dewatering/tubes/999999999", "422 403 403 422 403 403 403 422 401", EMPTY_JSON),
  // The body is read before the tube is looked up: {} is refused first.
  row("POST", "api/projects/:projectId/dewatering/tubes/:tubeId/fills", "/api/projects/{project}/dewatering/tubes/999999999/fills", "422 403 403 422 403 403 403 422 401", EMPTY_JSON),
  // Daily reports: every role but outreach reads them; the manager and the dive supervisor sign and amend ({}: 422).
  row("GET", "api/projects/:projectId/days/:date", `/api/projects/{project}/days/${PLAN_DATE}`, "200 200 200 200 200 403 200 200 401"),
  row("POST", "api/projects/:projectId/days/:date/countersign-requests", `/api/projects/{project}/days/${PLAN_DATE}/countersign-requests`, "422 403 422 403 403 403 403 422 401", EMPTY_JSON),
  row("PUT", "api/projects/:projectId/days/:date/equipment", `/api/projects/{project}/days/${PLAN_DATE}/equipment`, "422 403 422 403 403 403 403 422 401", EMPTY_JSON),
  row("PUT", "api/projects/:projectId/days/:date/crews", `/api/projects/{project}/days/${PLAN_DATE}/crews`, "422 403 422 403 403 403 403 422 401", EMPTY_JSON),
  row("PUT", "api/projects/:projectId/days/:date/weather-downtime", `/api/projects/{project}/days/${PLAN_DATE}/weather-downtime`, "422 403 422 403 403 403 403 422 401", EMPTY_JSON),
  row("PUT", "api/projects/:projectId/days/:date/visitors", `/api/projects/{project}/days/${PLAN_DATE}/visitors`, "422 403 422 403 403 403 403 422 401", EMPTY_JSON),
  row("POST", "api/projects/:projectId/days/:date/amendments", `/api/projects/{project}/days/${PLAN_DATE}/amendments`, "422 403 422 403 403 403 403 422 401", EMPTY_JSON),
  row("POST", "api/projects/:projectId/days/:date/sign", `/api/projects/{project}/days/${PLAN_DATE}/sign`, "422 403 422 403 403 403 403 422 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/dives", `/api/projects/{project}/dives?date=${PLAN_DATE}`, "200 200 200 200 200 200 200 200 401"),
  row("POST", "api/projects/:projectId/dives", "/api/projects/{project}/dives", "422 403 422 403 403 403 403 422 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/haul-sites", "/api/projects/{project}/haul-sites", "200 200 200 200 200 200 200 200 401"),
  row("POST", "api/projects/:projectId/haul-sites", "/api/projects/{project}/haul-sites", "422 403 403 422 403 403 403 422 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/hauls", "/api/projects/{project}/hauls", "200 200 200 200 200 200 200 200 401"),
  row("POST", "api/projects/:projectId/hauls", "/api/projects/{project}/hauls", "422 403 403 422 403 403 403 422 401", EMPTY_JSON),
  row("POST", "api/projects/:projectId/hauls/:haulId/photos", "/api/projects/{project}/hauls/999999999/photos", "415 403 403 415 403 403 403 415 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/hauls/:haulId/photos/:photoId", "/api/projects/{project}/hauls/999999999/photos/999999999", "404 404 404 404 404 404 404 404 401"),
  // Finds: outreach sees nothing of finds; the monitor and the manager log them ({} and unknown ids: 422 or 404).
  row("GET", "api/projects/:projectId/finds", "/api/projects/{project}/finds", "200 200 200 200 200 403 200 200 401"),
  row("POST", "api/projects/:projectId/finds", "/api/projects/{project}/finds", "422 403 403 403 422 403 403 422 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/finds.csv", "/api/projects/{project}/finds.csv", "200 403 403 403 200 403 403 200 401"),
  row("GET", "api/projects/:projectId/finds/:findId", "/api/projects/{project}/finds/999999999", "404 404 404 404 404 403 404 404 401"),
  row("PATCH", "api/projects/:projectId/finds/:findId", "/api/projects/{project}/finds/999999999", "422 403 403 403 422 403 403 422 401", EMPTY_JSON),
  row("POST", "api/projects/:projectId/finds/:findId/custody", "/api/projects/{project}/finds/999999999/custody", "422 403 403 403 422 403 403 422 401", EMPTY_JSON),
  // A JSON body where the photo upload takes multipart: 415 for those who may add photos.
  row("POST", "api/projects/:projectId/finds/:findId/photos", "/api/projects/{project}/finds/999999999/photos", "415 403 403 403 415 403 403 415 401", EMPTY_JSON),
  row("POST", "api/projects/:projectId/finds/:findId/custody/:custodyId/form-photo", "/api/projects/{project}/finds/999999999/custody/999999999/form-photo", "415 403 403 403 415 403 403 415 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/finds/:findId/photos/:photoId", "/api/projects/{project}/finds/999999999/photos/999999999", "404 404 404 404 404 403 404 404 401"),
  row("POST", "api/projects/:projectId/finds/baskets", "/api/projects/{project}/finds/baskets", "422 403 403 403 422 403 403 422 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/holds", "/api/projects/{project}/holds", "200 200 200 200 200 403 200 200 401"),
  row("POST", "api/projects/:projectId/holds/:holdId/lift", "/api/projects/{project}/holds/999999999/lift", "422 403 403 403 422 403 403 422 401", EMPTY_JSON),
  // A hold's notices: read by the roles that see find locations, recorded by those who lift holds.
  row("GET", "api/projects/:projectId/holds/:holdId/notices", "/api/projects/{project}/holds/999999999/notices", "404 403 403 403 404 403 403 404 401"),
  row("POST", "api/projects/:projectId/holds/:holdId/notices", "/api/projects/{project}/holds/999999999/notices", "422 403 403 403 422 403 403 422 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/members", "/api/projects/{project}/members", "200 403 403 403 403 403 403 200 401"),
  row("POST", "api/projects/:projectId/members", "/api/projects/{project}/members", "422 403 403 403 403 403 403 422 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/pay-periods", "/api/projects/{project}/pay-periods", "200 200 200 403 403 403 200 200 401"),
  row("POST", "api/projects/:projectId/pay-periods", "/api/projects/{project}/pay-periods", "422 403 403 403 403 403 403 422 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/progress", "/api/projects/{project}/progress", "200 200 200 200 200 200 200 200 401"),
  row("GET", "api/projects/:projectId/quantities", "/api/projects/{project}/quantities", "200 200 200 403 403 403 200 200 401"),
  row("GET", "api/projects/:projectId/quantities.csv", "/api/projects/{project}/quantities.csv", "200 200 200 403 403 403 200 200 401"),
  row("GET", "api/projects/:projectId/quantities.geojson", "/api/projects/{project}/quantities.geojson", "200 200 200 403 403 403 200 200 401"),
  // Recomputing again (the manager; no body): a body with a field is refused before anything starts.
  row("POST", "api/projects/:projectId/recomputes", "/api/projects/{project}/recomputes", "422 403 403 403 403 403 403 422 401", { json: { unexpected: true } }),
  row("GET", "api/projects/:projectId/recomputes/:jobId", "/api/projects/{project}/recomputes/999999999", "404 403 403 403 403 403 403 404 401"),
  row("GET", "api/projects/:projectId/report-subscribers", "/api/projects/{project}/report-subscribers", "200 403 403 403 403 403 403 200 401"),
  row("POST", "api/projects/:projectId/report-subscribers", "/api/projects/{project}/report-subscribers", "422 403 403 403 403 403 403 422 401", EMPTY_JSON),
  row("DELETE", "api/projects/:projectId/report-subscribers/:subscriberId", "/api/projects/{project}/report-subscribers/999999999", "404 403 403 403 403 403 403 404 401"),
  row("GET", "api/projects/:projectId/reconciliation", "/api/projects/{project}/reconciliation", "200 200 200 200 200 200 200 200 401"),
  // Restoring: a site admin only; the demo project is open, so the admin's answer is 409.
  row("POST", "api/projects/:projectId/restore", "/api/projects/{project}/restore", "403 403 403 403 403 403 403 409 401"),
  row("GET", "api/projects/:projectId/sediment-samples", "/api/projects/{project}/sediment-samples", "200 200 200 200 200 200 200 200 401"),
  row("POST", "api/projects/:projectId/sediment-samples", "/api/projects/{project}/sediment-samples", "422 403 403 403 422 403 403 422 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/share-links", "/api/projects/{project}/share-links", "200 403 403 403 403 200 403 200 401"),
  row("POST", "api/projects/:projectId/share-links", "/api/projects/{project}/share-links", "422 403 403 403 403 422 403 422 401", EMPTY_JSON),
  row("DELETE", "api/projects/:projectId/share-links/:token", "/api/projects/{project}/share-links/no-such-token-0123456789", "404 403 403 403 403 404 403 404 401"),
  row("GET", "api/projects/:projectId/stop-work", "/api/projects/{project}/stop-work", "200 200 200 200 200 200 200 200 401"),
  // Resuming work: the manager or the resource monitor ({} has no note: 422 before the event is looked up).
  row("POST", "api/projects/:projectId/stop-work/:eventId/notification", "/api/projects/{project}/stop-work/999999999/notification", "422 403 403 403 422 403 403 422 401", EMPTY_JSON),
  row("POST", "api/projects/:projectId/stop-work/:eventId/resume", "/api/projects/{project}/stop-work/999999999/resume", "422 403 403 403 422 403 403 422 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/surveys", "/api/projects/{project}/surveys", "200 200 200 200 200 200 200 200 401"),
  // A JSON body where the upload takes multipart: 415 for those who may upload.
  row("POST", "api/projects/:projectId/surveys", "/api/projects/{project}/surveys", "415 415 403 403 403 403 403 415 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/surveys/:surveyId", "/api/projects/{project}/surveys/{survey}", "200 200 200 200 200 200 200 200 401"),
  row("DELETE", "api/projects/:projectId/surveys/:surveyId", "/api/projects/{project}/surveys/{survey}", "422 403 403 403 403 403 403 422 401", EMPTY_JSON),
  row("PATCH", "api/projects/:projectId/surveys/:surveyId", "/api/projects/{project}/surveys/{survey}", "422 403 403 403 403 403 403 422 401", EMPTY_JSON),
  row("PUT", "api/projects/:projectId/surveys/:surveyId/bias", "/api/projects/{project}/surveys/{survey}/bias", "422 422 403 403 403 403 403 422 401", EMPTY_JSON),
  // Dive teams: every member reads them; the manager and the dive supervisor set them up ({} and unknown ids: 422 or 404).
  row("GET", "api/projects/:projectId/teams", "/api/projects/{project}/teams", "200 200 200 200 200 200 200 200 401"),
  row("POST", "api/projects/:projectId/teams", "/api/projects/{project}/teams", "422 403 422 403 403 403 403 422 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/teams/:teamId", "/api/projects/{project}/teams/999999999", "404 404 404 404 404 404 404 404 401"),
  row("PATCH", "api/projects/:projectId/teams/:teamId", "/api/projects/{project}/teams/999999999", "422 403 422 403 403 403 403 422 401", EMPTY_JSON),
  row("DELETE", "api/projects/:projectId/teams/:teamId", "/api/projects/{project}/teams/999999999", "404 403 404 403 403 403 403 404 401"),
  // Water quality: readings by the manager, the dewatering operator and the resource monitor; stations and rules by the manager.
  row("GET", "api/projects/:projectId/water-quality/readings", "/api/projects/{project}/water-quality/readings", "200 200 200 200 200 200 200 200 401"),
  row("POST", "api/projects/:projectId/water-quality/readings", "/api/projects/{project}/water-quality/readings", "422 403 403 422 422 403 403 422 401", EMPTY_JSON),
  row("POST", "api/projects/:projectId/water-quality/readings/:readingId/photos", "/api/projects/{project}/water-quality/readings/999999999/photos", "415 403 403 415 415 403 403 415 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/water-quality/readings/:readingId/photos/:photoId", "/api/projects/{project}/water-quality/readings/999999999/photos/999999999", "404 404 404 404 404 404 404 404 401"),
  row("GET", "api/projects/:projectId/water-quality/rules", "/api/projects/{project}/water-quality/rules", "200 200 200 200 200 200 200 200 401"),
  row("POST", "api/projects/:projectId/water-quality/rules", "/api/projects/{project}/water-quality/rules", "422 403 403 403 403 403 403 422 401", EMPTY_JSON),
  row("GET", "api/projects/:projectId/water-quality/stations", "/api/projects/{project}/water-quality/stations", "200 200 200 200 200 200 200 200 401"),
  row("POST", "api/projects/:projectId/water-quality/stations", "/api/projects/{project}/water-quality/stations", "422 403 403 403 403 403 403 422 401", EMPTY_JSON),
  // Wildlife sightings: whoever watches the water near the work.
  row("GET", "api/projects/:projectId/wildlife/sightings", "/api/projects/{project}/wildlife/sightings", "200 200 200 200 200 200 200 200 401"),
  row("POST", "api/projects/:projectId/wildlife/sightings", "/api/projects/{project}/wildlife/sightings", "422 403 422 422 422 403 403 422 401", EMPTY_JSON),

  row("GET", "dev/mail", "/dev/mail", "403 403 403 403 403 403 403 200 login"),
  row("GET", "dev/mail/:messageId", "/dev/mail/no-such-message", "403 403 403 403 403 403 403 404 login"),
  row("GET", "forgot-password", "/forgot-password", "200 200 200 200 200 200 200 200 200"),
  row("POST", "forgot-password", "/forgot-password", "400 400 400 400 400 400 400 400 400", { form: { email: "" } }),
  row("GET", "healthz", "/healthz", "200 200 200 200 200 200 200 200 200"),
  row("GET", "invite/:token", "/invite/no-such-token", "200 200 200 200 200 200 200 200 200"),
  row("POST", "invite/:token", "/invite/no-such-token", "410 410 410 410 410 410 410 410 410", { form: { name: "Nobody", password: "" } }),
  row("GET", "login", "/login", "302 /projects|302 /projects|302 /projects|302 /projects|302 /projects|302 /projects|302 /projects|302 /projects|200"),
  // No e-mail at all: refused by the form's schema, before the sign-in rate limit counts it. Signed
  // in, the page's loader (which runs after the action) sends the person on to their projects.
  row("POST", "login", "/login", "302 /projects|302 /projects|302 /projects|302 /projects|302 /projects|302 /projects|302 /projects|302 /projects|400", { form: { email: "", password: "" } }),
  row("GET", "logout", "/logout", "302 /|302 /|302 /|302 /|302 /|302 /|302 /|302 /|302 /"),
  row("GET", "projects", "/projects", "200 200 200 200 200 200 200 200 login"),
  // The new-project form: the site admin only among the demo's accounts (a bogus form: 400).
  row("POST", "projects", "/projects", "403 403 403 403 403 403 403 400 login", BOGUS_INTENT),

  // A project's pages (the layout and its index share the project's URL).
  row("GET", "projects/:projectId", "/projects/{project}", "200 200 200 200 200 200 200 200 login"),
  // Archiving is only tried on a project that does not exist here (the demo must stay open); a GET goes to the settings page.
  row("GET", "projects/:projectId/archive", "/projects/999999999/archive", "302 /projects/999999999/settings|302 /projects/999999999/settings|302 /projects/999999999/settings|302 /projects/999999999/settings|302 /projects/999999999/settings|302 /projects/999999999/settings|302 /projects/999999999/settings|302 /projects/999999999/settings|302 /projects/999999999/settings"),
  row("POST", "projects/:projectId/archive", "/projects/999999999/archive", "404 404 404 404 404 404 404 404 login", { form: {} }),
  row("GET", "projects/:projectId/audit", "/projects/{project}/audit", "200 403 403 403 403 403 403 200 login"),
  row("GET", "projects/:projectId/days", "/projects/{project}/days", "200 200 200 200 200 403 200 200 login"),
  // Subscribers and the two-week batch's sending: the manager (and a site admin).
  row("POST", "projects/:projectId/days", "/projects/{project}/days", "400 403 403 403 403 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/days/:date", `/projects/{project}/days/${PLAN_DATE}`, "200 200 200 200 200 403 200 200 login"),
  row("POST", "projects/:projectId/days/:date", `/projects/{project}/days/${PLAN_DATE}`, "400 403 400 403 403 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/dewatering", "/projects/{project}/dewatering", "200 200 200 200 200 200 200 200 login"),
  row("POST", "projects/:projectId/dewatering", "/projects/{project}/dewatering", "400 403 403 400 403 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/dewatering/hauls", "/projects/{project}/dewatering/hauls", "200 200 200 200 200 200 200 200 login"),
  row("POST", "projects/:projectId/dewatering/hauls", "/projects/{project}/dewatering/hauls", "400 403 403 400 403 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/dewatering/jar-tests", "/projects/{project}/dewatering/jar-tests", "200 200 200 200 200 200 200 200 login"),
  row("POST", "projects/:projectId/dewatering/jar-tests", "/projects/{project}/dewatering/jar-tests", "400 403 403 400 403 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/dewatering/samples", "/projects/{project}/dewatering/samples", "200 200 200 200 200 200 200 200 login"),
  row("POST", "projects/:projectId/dewatering/samples", "/projects/{project}/dewatering/samples", "400 403 403 403 400 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/dewatering/tubes", "/projects/{project}/dewatering/tubes", "200 200 200 200 200 200 200 200 login"),
  row("POST", "projects/:projectId/dewatering/tubes", "/projects/{project}/dewatering/tubes", "400 403 403 400 403 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/finds", "/projects/{project}/finds", "200 200 200 200 200 403 200 200 login"),
  row("GET", "projects/:projectId/finds/:findId", "/projects/{project}/finds/999999999", "404 404 404 404 404 403 404 404 login"),
  row("POST", "projects/:projectId/finds/:findId", "/projects/{project}/finds/999999999", "400 403 403 403 400 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/finds/basket", "/projects/{project}/finds/basket", "200 403 403 403 200 403 403 200 login"),
  row("POST", "projects/:projectId/finds/basket", "/projects/{project}/finds/basket", "400 403 403 403 400 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/finds/new", "/projects/{project}/finds/new", "200 403 403 403 200 403 403 200 login"),
  row("POST", "projects/:projectId/finds/new", "/projects/{project}/finds/new", "400 403 403 403 400 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/holds", "/projects/{project}/holds", "200 200 200 200 200 403 200 200 login"),
  row("POST", "projects/:projectId/holds", "/projects/{project}/holds", "400 403 403 403 400 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/map", "/projects/{project}/map", "200 200 200 200 200 200 200 200 login"),
  row("POST", "projects/:projectId/map", "/projects/{project}/map", "400 403 403 403 403 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/members", "/projects/{project}/members", "200 403 403 403 403 403 403 200 login"),
  row("POST", "projects/:projectId/members", "/projects/{project}/members", "400 403 403 403 403 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/plans", "/projects/{project}/plans", "200 200 200 200 200 200 200 200 login"),
  row("GET", "projects/:projectId/plans/:date", `/projects/{project}/plans/${PLAN_DATE}`, "200 200 200 200 200 200 200 200 login"),
  row("POST", "projects/:projectId/plans/:date", `/projects/{project}/plans/${PLAN_DATE}`, "400 403 400 403 403 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/quantities", "/projects/{project}/quantities", "200 200 200 403 403 403 200 200 login"),
  // Signing a pay period: the manager (and a site admin) only; readers of quantities get 403.
  row("POST", "projects/:projectId/quantities", "/projects/{project}/quantities", "400 403 403 403 403 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/settings", "/projects/{project}/settings", "200 403 403 403 403 403 403 200 login"),
  row("POST", "projects/:projectId/settings", "/projects/{project}/settings", "400 403 403 403 403 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/setup", "/projects/{project}/setup", "200 403 403 403 403 403 403 200 login"),
  row("GET", "projects/:projectId/share", "/projects/{project}/share", "200 403 403 403 403 200 403 200 login"),
  row("POST", "projects/:projectId/share", "/projects/{project}/share", "400 403 403 403 403 400 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/restore", "/projects/999999999/restore", "302 /projects/999999999|302 /projects/999999999|302 /projects/999999999|302 /projects/999999999|302 /projects/999999999|302 /projects/999999999|302 /projects/999999999|302 /projects/999999999|302 /projects/999999999"),
  // Restoring: a site admin only; the demo project is open, so the admin's answer is 409.
  row("POST", "projects/:projectId/restore", "/projects/{project}/restore", "403 403 403 403 403 403 403 409 login", { form: {} }),
  row("GET", "projects/:projectId/surveys", "/projects/{project}/surveys", "200 200 200 200 200 200 200 200 login"),
  row("GET", "projects/:projectId/surveys/:surveyId", "/projects/{project}/surveys/{survey}", "200 200 200 200 200 200 200 200 login"),
  row("POST", "projects/:projectId/surveys/:surveyId", "/projects/{project}/surveys/{survey}", "400 403 403 403 403 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/surveys/imports/:jobId", "/projects/{project}/surveys/imports/999999999", "404 404 403 403 403 403 403 404 login"),
  row("POST", "projects/:projectId/surveys/imports/:jobId", "/projects/{project}/surveys/imports/999999999", "404 404 403 403 403 403 403 404 login", { form: { intent: "discard" } }),
  row("GET", "projects/:projectId/surveys/new", "/projects/{project}/surveys/new", "200 200 403 403 403 403 403 200 login"),
  // A form that is not multipart, so no file: refused with 400 for those who may upload.
  row("POST", "projects/:projectId/surveys/new", "/projects/{project}/surveys/new", "400 400 403 403 403 403 403 400 login", { form: { kind: "baseline" } }),
  // Water quality: every member reads it; a bogus form is 400 for a role that may record something there, 403 for one that may not.
  row("GET", "projects/:projectId/teams", "/projects/{project}/teams", "200 200 200 200 200 200 200 200 login"),
  row("POST", "projects/:projectId/teams", "/projects/{project}/teams", "400 403 400 403 403 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/water-quality", "/projects/{project}/water-quality", "200 200 200 200 200 200 200 200 login"),
  row("POST", "projects/:projectId/water-quality", "/projects/{project}/water-quality", "400 403 400 400 400 403 403 400 login", BOGUS_INTENT),
  row("GET", "projects/:projectId/water-quality/compliance", "/projects/{project}/water-quality/compliance", "200 200 200 200 200 200 200 200 login"),
  row("GET", "projects/:projectId/water-quality/setup", "/projects/{project}/water-quality/setup", "200 403 403 403 403 403 403 200 login"),
  row("POST", "projects/:projectId/water-quality/setup", "/projects/{project}/water-quality/setup", "400 403 403 403 403 403 403 400 login", BOGUS_INTENT),

  // A project's resource routes.
  // The field page: every member opens it (the forms shown follow the permission table); it has no action.
  row("GET", "projects/:projectId/field", "/projects/{project}/field", "200 200 200 200 200 200 200 200 login"),
  row("GET", "projects/:projectId/days/:date/report.pdf", `/projects/{project}/days/${PLAN_DATE}/report.pdf`, "200 200 200 200 200 403 200 200 login"),
  row("GET", "projects/:projectId/days/batch.pdf", `/projects/{project}/days/batch.pdf?from=2029-12-31&to=${PLAN_DATE}`, "200 200 200 200 200 403 200 200 login"),
  row("GET", "projects/:projectId/finds/catalogue", "/projects/{project}/finds/catalogue", "200 403 403 403 200 403 403 200 login"),
  row("GET", "projects/:projectId/finds/custody-sheet", "/projects/{project}/finds/custody-sheet?find=999999999", "404 404 404 404 404 403 404 404 login"),
  row("GET", "projects/:projectId/finds/:findId/custody-sheet", "/projects/{project}/finds/999999999/custody-sheet", "404 404 404 404 404 403 404 404 login"),
  row("GET", "projects/:projectId/map/style.json", "/projects/{project}/map/style.json", "200 200 200 200 200 200 200 200 login"),
  row("GET", "projects/:projectId/quantities/report", "/projects/{project}/quantities/report", "200 200 200 403 403 403 200 200 login"),
  row("GET", "projects/:projectId/surveys/imports/:jobId/problems.csv", "/projects/{project}/surveys/imports/999999999/problems.csv", "404 404 403 403 403 403 403 404 login"),
  row("GET", "projects/:projectId/surveys/imports/:jobId/progress", "/projects/{project}/surveys/imports/999999999/progress", "404 404 403 403 403 403 403 404 login"),
  row("POST", "projects/:projectId/surveys/upload", "/projects/{project}/surveys/upload", "400 400 403 403 403 403 403 400 login", { form: { kind: "baseline" } }),
  row("GET", "projects/:projectId/water-quality/readings.csv", "/projects/{project}/water-quality/readings.csv", "200 200 200 200 200 200 200 200 login"),

  // The inspector's countersign link: open to anyone holding it (an unknown token shows why; posting to it is 410).
  row("GET", "countersign/:token", "/countersign/no-such-token", "200 200 200 200 200 200 200 200 200"),
  row("POST", "countersign/:token", "/countersign/no-such-token", "410 410 410 410 410 410 410 410 410", { form: { name: "Nobody" } }),
  row("GET", "reset-password/:token", "/reset-password/no-such-token", "200 200 200 200 200 200 200 200 200"),
  row("POST", "reset-password/:token", "/reset-password/no-such-token", "400 400 400 400 400 400 400 400 400", { form: { password: "", confirm: "" } }),
  row("GET", "share/:token", "/share/no-such-token-0123456789", "404 404 404 404 404 404 404 404 404"),
  // Last: signing out ends the session the rows above used.
  row("POST", "logout", "/logout", "302 /login|302 /login|302 /login|302 /login|302 /login|302 /login|302 /login|302 /login|302 /login"),
];

/** The expected answer in `column` of a row: cells are split on "|" when they hold a space, else on spaces. */
function expectedFor(entry: Row, column: Column): string {
  const cells = entry.expected.includes("|") ? entry.expected.split("|") : entry.expected.split(" ");
  expect(cells, `${entry.method} ${entry.url}: one cell per column`).toHaveLength(COLUMNS.length);
  return cells[COLUMNS.indexOf(column)].trim();
}

interface DemoIds {
  project: number;
  survey: number;
  cell: string;
}

function urlOf(entry: Row, ids: DemoIds): string {
  return entry.url.replace("{project}", String(ids.project)).replace("{survey}", String(ids.survey)).replace("{cell}", ids.cell);
}

async function send(context: APIRequestContext, entry: Row, url: string, origin: string): Promise<APIResponse> {
  const body = entry.body === undefined ? {} : "json" in entry.body ? { data: entry.body.json } : { form: entry.body.form };
  return context.fetch(url, { method: entry.method, maxRedirects: 0, headers: entry.method === "GET" ? {} : { Origin: origin }, ...body });
}

async function checkRow(context: APIRequestContext, entry: Row, column: Column, ids: DemoIds, origin: string) {
  const url = urlOf(entry, ids);
  const expected = expectedFor(entry, column);
  const response = await send(context, entry, url, origin);
  const what = `${column} ${entry.method} ${url}`;
  if (expected === "login") {
    expect(response.status(), what).toBe(302);
    expect(response.headers().location, what).toBe(`/login?next=${encodeURIComponent(url)}`);
  } else if (expected.startsWith("302 ")) {
    expect(response.status(), what).toBe(302);
    expect(response.headers().location, what).toBe(expected.slice(4));
  } else {
    expect(response.status(), what).toBe(Number(expected));
  }
  // The API answers every refusal in its one JSON error shape.
  if (url.startsWith("/api/") && response.status() >= 400) {
    expect(response.headers()["content-type"], what).toMatch(/^application\/json/);
    const answer = (await response.json()) as { errors?: Array<{ message?: unknown }> };
    expect(typeof answer.errors?.[0]?.message, what).toBe("string");
  }
}

/** The methods a route file answers, read from its source: apiRoute's handlers, or GET for a loader or page and POST for an action. */
function methodsOf(file: string): string[] {
  const source = readFileSync(join(import.meta.dirname, "..", "..", "app", file), "utf8");
  if (source.includes("apiRoute")) {
    const handlers = source.slice(source.indexOf("apiRoute<"));
    return [...new Set([...handlers.matchAll(/\b(GET|POST|PUT|PATCH|DELETE)\b\s*[(:]/g)].map((match) => match[1]))];
  }
  const methods: string[] = [];
  if (/export (async function|const|function) loader\b/.test(source) || /export default function/.test(source)) methods.push("GET");
  if (/export (async function|const|function) action\b/.test(source)) methods.push("POST");
  return methods;
}

test.describe("route × role matrix", () => {
  let ids: DemoIds;

  test.beforeAll(async ({ baseURL }) => {
    const context = await playwrightRequest.newContext({ baseURL });
    const project = await demoProjectId(context, baseURL!);
    const surveys = (await (await context.get(`/api/projects/${project}/surveys`)).json()) as { surveys: Array<{ id: number }> };
    const cells = (await (await context.get(`/api/projects/${project}/cells`)).json()) as { grid: { cols: number; firstRow: number; firstCol: number }; status: number[] };
    // A cell with figures (status above "no-data"), so its detail exists.
    const index = cells.status.findIndex((code) => code > 0);
    ids = { project, survey: surveys.surveys[0].id, cell: cellLabel(Math.floor(index / cells.grid.cols) + cells.grid.firstRow, (index % cells.grid.cols) + cells.grid.firstCol) };
    await context.dispose();
  });

  test("the matrix has a row for every route in app/routes.ts and every method it answers", () => {
    const routes = configuredRoutes();
    const missing: string[] = [];
    for (const { path, file } of routes) {
      for (const method of methodsOf(file)) {
        const rows = MATRIX.filter((entry) => entry.route === path && (method === "POST" && !file.includes("api.") ? entry.method !== "GET" : entry.method === method));
        if (rows.length === 0) missing.push(`${method} ${path || "/"} (${file})`);
      }
    }
    expect(missing, "routes without a row in MATRIX").toEqual([]);
    const known = new Set(routes.map((route) => route.path));
    expect(MATRIX.filter((entry) => !known.has(entry.route)).map((entry) => entry.route), "rows naming no route").toEqual([]);
  });

  for (const account of Object.keys(DEMO_ACCOUNTS) as DemoAccount[]) {
    test(`${account}: every route answers as the matrix says`, async ({ baseURL }) => {
      test.setTimeout(180_000);
      const context = await playwrightRequest.newContext({ baseURL });
      await signInRequest(context, baseURL!, DEMO_ACCOUNTS[account]);
      for (const entry of MATRIX) await checkRow(context, entry, account, ids, new URL(baseURL!).origin);
      await context.dispose();
    });
  }

  test("signed out: pages send to sign in and come back after, the API answers JSON 401", async ({ baseURL }) => {
    test.setTimeout(180_000);
    const context = await playwrightRequest.newContext({ baseURL });
    for (const entry of MATRIX) await checkRow(context, entry, "signed-out", ids, new URL(baseURL!).origin);
    await context.dispose();
  });

  test("a form posted from another site is refused with 403", async ({ baseURL }) => {
    const context = await playwrightRequest.newContext({ baseURL });
    const foreign = await context.post("/login", {
      form: { email: DEMO_ACCOUNTS.manager, password: "firmsand-demo" },
      headers: { Origin: "http://elsewhere.example" },
      maxRedirects: 0,
    });
    // React Router itself refuses an action whose Origin names another host (400 Bad Request)
    // before Firmsand's own check (403) runs; either way nothing is done and no session is made.
    expect([400, 403]).toContain(foreign.status());
    expect(foreign.headers()["set-cookie"]).toBeUndefined();
    const missing = await context.post("/login", { form: { email: DEMO_ACCOUNTS.manager, password: "firmsand-demo" }, maxRedirects: 0 });
    // A POST without any Origin passes React Router's check; Firmsand's middleware refuses it.
    expect(missing.status()).toBe(403);
    expect(missing.headers()["set-cookie"]).toBeUndefined();
    await context.dispose();
  });

  test("health check reports the database", async ({ baseURL }) => {
    const context = await playwrightRequest.newContext({ baseURL });
    const response = await context.get("/healthz");
    expect(response.status()).toBe(200);
    expect(await response.json()).toEqual({ ok: true, db: "up" });
    await context.dispose();
  });
});
