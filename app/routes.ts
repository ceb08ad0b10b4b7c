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
    route("surveys", "routes/project-surveys.tsx"),
    route("members", "routes/project-members.tsx"),
    route("audit", "routes/project-audit.tsx"),
  ]),
  route("dev/mail", "routes/dev-mail.tsx", [
    route(":messageId", "routes/dev-mail-message.tsx"),
  ]),
] satisfies RouteConfig;
