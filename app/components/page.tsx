/** A page's main area with its heading. */
export function Page({ title, children, wide = false }: { title: string; children: React.ReactNode; wide?: boolean }) {
  return (
    <main className={`mx-auto p-6 ${wide ? "max-w-5xl" : "max-w-xl"}`}>
      <h1 className="text-2xl font-semibold text-lagoon-dark">{title}</h1>
      <div className="mt-6">{children}</div>
    </main>
  );
}
