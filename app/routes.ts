import { type RouteConfig, index, route } from "@react-router/dev/routes";

// Every route is listed here explicitly.
export default [
  index("routes/home.tsx"),
  route("healthz", "routes/healthz.ts"),
  route("login", "routes/login.tsx"),
  route("logout", "routes/logout.ts"),
  route("forgot-password", "routes/forgot-password.tsx"),
  route("reset-password/:token", "routes/reset-password.tsx"),
  route("invite/:token", "routes/invite.tsx"),
  route("account", "routes/account.tsx"),
  route("projects", "routes/projects.tsx"),
  route("projects/:projectId", "routes/project-layout.tsx", [
    index("routes/project-overview.tsx"),
    route("map", "routes/project-map.tsx"),
    route("surveys", "routes/projects.$projectId.surveys.tsx"),
    route("surveys/new", "routes/projects.$projectId.surveys.new.tsx"),
    route("surveys/imports/:jobId", "routes/projects.$projectId.surveys.imports.$jobId.tsx"),
    route("surveys/:surveyId", "routes/projects.$projectId.surveys.$surveyId.tsx"),
    route("members", "routes/project-members.tsx"),
    route("audit", "routes/project-audit.tsx"),
    route("plans/:date", "routes/project-plan.tsx"),
    // Progress exports and public share links (issue 6).
    route("quantities", "routes/projects.$projectId.quantities.tsx"),
    route("share", "routes/projects.$projectId.share.tsx"),
  ]),
  // Survey import: resource routes (JSON, CSV) outside the project layout.
  route("projects/:projectId/surveys/upload", "routes/projects.$projectId.surveys.upload.ts"),
  route("projects/:projectId/surveys/imports/:jobId/progress", "routes/projects.$projectId.surveys.imports.$jobId.progress.ts"),
  route("projects/:projectId/surveys/imports/:jobId/problems.csv", "routes/projects.$projectId.surveys.imports.$jobId.problems[.]csv.ts"),
  route("api/projects/:projectId/surveys", "routes/api.projects.$projectId.surveys.ts"),
  route("api/projects/:projectId/surveys/:surveyId", "routes/api.projects.$projectId.surveys.$surveyId.ts"),
  // Progress: JSON, CSV, GeoJSON, the printable report and the public share page (issue 6).
  route("api/projects/:projectId/progress", "routes/api.projects.$projectId.progress.ts"),
  route("api/projects/:projectId/quantities.csv", "routes/api.projects.$projectId.quantities[.]csv.ts"),
  route("api/projects/:projectId/quantities.geojson", "routes/api.projects.$projectId.quantities[.]geojson.ts"),
  route("api/projects/:projectId/share-links", "routes/api.projects.$projectId.share-links.ts"),
  route("api/projects/:projectId/share-links/:token", "routes/api.projects.$projectId.share-links.$token.ts"),
  route("projects/:projectId/quantities/report", "routes/projects.$projectId.quantities.report.tsx"),
  route("share/:token", "routes/share.$token.tsx"),
  // Coverage map and dive plans (issue 5): the offline map style and the map's JSON API.
  route("projects/:projectId/map/style.json", "routes/project-map-style[.]json.ts"),
  route("api/projects/:projectId/cells", "routes/api.projects.$projectId.cells.ts"),
  route("api/projects/:projectId/cells/:label", "routes/api.projects.$projectId.cells.$label.ts"),
  route("api/projects/:projectId/bands", "routes/api.projects.$projectId.bands.ts"),
  route("api/projects/:projectId/assignments", "routes/api.projects.$projectId.assignments.ts"),
  route("api/projects/:projectId/dives", "routes/api.projects.$projectId.dives.ts"),
  route("dev/mail", "routes/dev-mail.tsx", [
    route(":messageId", "routes/dev-mail-message.tsx"),
  ]),
] satisfies RouteConfig;
