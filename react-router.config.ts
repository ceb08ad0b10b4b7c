import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  // Route middleware: app/root.tsx checks the Origin of every mutating request in one place.
  future: { v8_middleware: true },
} satisfies Config;
