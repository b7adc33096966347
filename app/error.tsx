"use client";

export default function ErrorPage({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <main className="mx-auto max-w-xl px-6 py-24 text-center">
      <p className="eyebrow">Something went wrong</p>
      <h1 className="mt-2 text-2xl font-semibold">This page could not be shown</h1>
      <p className="mt-3 text-slate-600 dark:text-slate-400">The problem has been logged on the server. Your data is safe; try again.</p>
      <button onClick={reset} className="btn-primary mt-8">
        Try again
      </button>
    </main>
  );
}
