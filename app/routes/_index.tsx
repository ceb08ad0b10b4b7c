import { Link } from "react-router";
import type { Route } from "./+types/_index";

export function meta({}: Route.MetaArgs) {
  return [{ title: "Firmsand" }];
}

export default function Home() {
  return (
    <main className="mx-auto max-w-2xl p-8">
      <h1 className="text-3xl font-semibold text-lagoon-dark">Firmsand</h1>
      <p className="mt-3">Muck removal down to firm sand, cell by cell.</p>
      <p className="mt-6"><Link className="text-lagoon underline" to="/login">Sign in</Link></p>
    </main>
  );
}
