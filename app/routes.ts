import { type RouteConfig, index, route } from "@react-router/dev/routes";

// Every route, listed explicitly and ordered by URL. Each file is named after its URL in the
// flat file-route notation (`.` for `/`, `$param`, `_index` for an index route, `[.]` for a
// literal dot); nesting under a layout is decided here, not by the file name.
export default [
  index("routes/_index.tsx"),
  route("account", "routes/account.tsx"),
  route("admin/users", "routes/admin.users.tsx"),

  // The JSON, CSV and GeoJSON API (one access helper, one body reader, one error shape:
  // app/lib/api); any other /api address answers the API's JSON 404.
  route("api/*", "routes/api.$.ts"),
  route("api/admin/users", "routes/api.admin.users.ts"),
  route("api/admin/users/:userId", "routes/api.admin.users.$userId.ts"),
  route("api/projects", "routes/api.projects.ts"),
  route("api/projects/:projectId", "routes/api.projects.$projectId.ts"),
  route("api/projects/:projectId/assignments", "routes/api.projects.$projectId.assignments.ts"),
  route("api/projects/:projectId/bands", "routes/api.projects.$projectId.bands.ts"),
  route("api/projects/:projectId/cells", "routes/api.projects.$projectId.cells.ts"),
  route("api/projects/:projectId/cells/:label", "routes/api.projects.$projectId.cells.$label.ts"),
  route("api/projects/:projectId/dives", "routes/api.projects.$projectId.dives.ts"),
  route("api/projects/:projectId/progress", "routes/api.projects.$projectId.progress.ts"),
  route("api/projects/:projectId/quantities.csv", "routes/api.projects.$projectId.quantities[.]csv.ts"),
  route("api/projects/:projectId/quantities.geojson", "routes/api.projects.$projectId.quantities[.]geojson.ts"),
  route("api/projects/:projectId/share-links", "routes/api.projects.$projectId.share-links.ts"),
  route("api/projects/:projectId/share-links/:token", "routes/api.projects.$projectId.share-links.$token.ts"),
  route("api/projects/:projectId/stop-work", "routes/api.projects.$projectId.stop-work.ts"),
  route("api/projects/:projectId/stop-work/:eventId/notification", "routes/api.projects.$projectId.stop-work.$eventId.notification.ts"),
  route("api/projects/:projectId/stop-work/:eventId/resume", "routes/api.projects.$projectId.stop-work.$eventId.resume.ts"),
  route("api/projects/:projectId/surveys", "routes/api.projects.$projectId.surveys.ts"),
  route("api/projects/:projectId/surveys/:surveyId", "routes/api.projects.$projectId.surveys.$surveyId.ts"),
  route("api/projects/:projectId/water-quality/readings", "routes/api.projects.$projectId.water-quality.readings.ts"),
  route("api/projects/:projectId/water-quality/rules", "routes/api.projects.$projectId.water-quality.rules.ts"),
  route("api/projects/:projectId/water-quality/stations", "routes/api.projects.$projectId.water-quality.stations.ts"),
  route("api/projects/:projectId/wildlife/sightings", "routes/api.projects.$projectId.wildlife.sightings.ts"),

  route("dev/mail", "routes/dev.mail.tsx", [
    route(":messageId", "routes/dev.mail.$messageId.tsx"),
  ]),
  route("forgot-password", "routes/forgot-password.tsx"),
  route("healthz", "routes/healthz.ts"),
  route("invite/:token", "routes/invite.$token.tsx"),
  route("login", "routes/login.tsx"),
  route("logout", "routes/logout.ts"),
  route("projects", "routes/projects.tsx"),

  // A project's pages share its layout (name, navigation); resource routes (JSON, CSV, the
  // printable report, the map style) sit outside it.
  route("projects/:projectId", "routes/projects.$projectId.tsx", [
    index("routes/projects.$projectId._index.tsx"),
    route("audit", "routes/projects.$projectId.audit.tsx"),
    route("map", "routes/projects.$projectId.map.tsx"),
    route("members", "routes/projects.$projectId.members.tsx"),
    route("plans/:date", "routes/projects.$projectId.plans.$date.tsx"),
    route("quantities", "routes/projects.$projectId.quantities.tsx"),
    route("settings", "routes/projects.$projectId.settings.tsx"),
    route("share", "routes/projects.$projectId.share.tsx"),
    route("surveys", "routes/projects.$projectId.surveys.tsx"),
    route("surveys/:surveyId", "routes/projects.$projectId.surveys.$surveyId.tsx"),
    route("surveys/imports/:jobId", "routes/projects.$projectId.surveys.imports.$jobId.tsx"),
    route("surveys/new", "routes/projects.$projectId.surveys.new.tsx"),
    route("water-quality", "routes/projects.$projectId.water-quality.tsx"),
    route("water-quality/compliance", "routes/projects.$projectId.water-quality.compliance.tsx"),
    route("water-quality/setup", "routes/projects.$projectId.water-quality.setup.tsx"),
  ]),
  route("projects/:projectId/map/style.json", "routes/projects.$projectId.map.style[.]json.ts"),
  route("projects/:projectId/quantities/report", "routes/projects.$projectId.quantities.report.tsx"),
  route("projects/:projectId/surveys/imports/:jobId/problems.csv", "routes/projects.$projectId.surveys.imports.$jobId.problems[.]csv.ts"),
  route("projects/:projectId/surveys/imports/:jobId/progress", "routes/projects.$projectId.surveys.imports.$jobId.progress.ts"),
  route("projects/:projectId/surveys/upload", "routes/projects.$projectId.surveys.upload.ts"),
  route("projects/:projectId/water-quality/readings.csv", "routes/projects.$projectId.water-quality.readings[.]csv.ts"),
  route("reset-password/:token", "routes/reset-password.$token.tsx"),
  route("share/:token", "routes/share.$token.tsx"),
] satisfies RouteConfig;
