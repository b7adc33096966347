/** An unknown viewpoint-link token (status 404). */
export default function LinkNotFound() {
  return (
    <main className="mx-auto max-w-xl px-6 py-24 text-center" data-testid="link-not-found">
      <p className="eyebrow">Shared view</p>
      <h1 className="mt-2 text-2xl font-semibold">This link does not work</h1>
      <p className="mt-3 text-slate-600 dark:text-slate-400">Check that the whole link was copied. Links are long on purpose.</p>
    </main>
  );
}
