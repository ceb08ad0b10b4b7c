import { type RouteConfig, index, layout, prefix, route } from "@react-router/dev/routes";

// Every route is listed here explicitly.
export default [
  index("routes/home.tsx"),
  route("healthz", "routes/healthz.ts"),
  route("login", "routes/login.tsx"),
  route("logout", "routes/logout.ts"),
  route("projects", "routes/projects.tsx"),
  route("projects/:projectId", "routes/project-layout.tsx", [
    index("routes/project-overview.tsx"),
    route("map", "routes/project-map.tsx"),
    route("surveys", "routes/project-surveys.tsx"),
  ]),
] satisfies RouteConfig;
