import { type RouteConfig, index, route } from "@react-router/dev/routes";

// Every route is listed here explicitly.
export default [
  index("routes/home.tsx"),
  route("healthz", "routes/healthz.ts"),
] satisfies RouteConfig;
