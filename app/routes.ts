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
  route("api/projects/:projectId/finds", "routes/api.projects.$projectId.finds.ts"),
  route("api/projects/:projectId/finds.csv", "routes/api.projects.$projectId.finds[.]csv.ts"),
  route("api/projects/:projectId/finds/:findId", "routes/api.projects.$projectId.finds.$findId.ts"),
  route("api/projects/:projectId/finds/:findId/custody", "routes/api.projects.$projectId.finds.$findId.custody.ts"),
  route("api/projects/:projectId/finds/:findId/photos", "routes/api.projects.$projectId.finds.$findId.photos.ts"),
  route("api/projects/:projectId/finds/:findId/photos/:photoId", "routes/api.projects.$projectId.finds.$findId.photos.$photoId.ts"),
  route("api/projects/:projectId/holds", "routes/api.projects.$projectId.holds.ts"),
  route("api/projects/:projectId/holds/:holdId/lift", "routes/api.projects.$projectId.holds.$holdId.lift.ts"),
  route("api/projects/:projectId/progress", "routes/api.projects.$projectId.progress.ts"),
  route("api/projects/:projectId/quantities.csv", "routes/api.projects.$projectId.quantities[.]csv.ts"),
  route("api/projects/:projectId/quantities.geojson", "routes/api.projects.$projectId.quantities[.]geojson.ts"),
  route("api/projects/:projectId/share-links", "routes/api.projects.$projectId.share-links.ts"),
  route("api/projects/:projectId/share-links/:token", "routes/api.projects.$projectId.share-links.$token.ts"),
  route("api/projects/:projectId/surveys", "routes/api.projects.$projectId.surveys.ts"),
  route("api/projects/:projectId/surveys/:surveyId", "routes/api.projects.$projectId.surveys.$surveyId.ts"),

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
    route("finds", "routes/projects.$projectId.finds.tsx"),
    route("finds/:findId", "routes/projects.$projectId.finds.$findId.tsx"),
    route("finds/new", "routes/projects.$projectId.finds.new.tsx"),
    route("holds", "routes/projects.$projectId.holds.tsx"),
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
  ]),
  route("projects/:projectId/finds/catalogue", "routes/projects.$projectId.finds.catalogue.tsx"),
  route("projects/:projectId/finds/:findId/custody-sheet", "routes/projects.$projectId.finds.$findId.custody-sheet.tsx"),
  route("projects/:projectId/map/style.json", "routes/projects.$projectId.map.style[.]json.ts"),
  route("projects/:projectId/quantities/report", "routes/projects.$projectId.quantities.report.tsx"),
  route("projects/:projectId/surveys/imports/:jobId/problems.csv", "routes/projects.$projectId.surveys.imports.$jobId.problems[.]csv.ts"),
  route("projects/:projectId/surveys/imports/:jobId/progress", "routes/projects.$projectId.surveys.imports.$jobId.progress.ts"),
  route("projects/:projectId/surveys/upload", "routes/projects.$projectId.surveys.upload.ts"),
  route("reset-password/:token", "routes/reset-password.$token.tsx"),
  route("share/:token", "routes/share.$token.tsx"),
] satisfies RouteConfig;
