import Link from "next/link";

export default function NotFound() {
  return (
    <main className="mx-auto max-w-xl px-6 py-24 text-center">
      <p className="eyebrow">404</p>
      <h1 className="mt-2 text-2xl font-semibold">Nothing mapped here</h1>
      <p className="mt-3 text-slate-600 dark:text-slate-400">This page does not exist, or you are not a member of the study it belongs to.</p>
      <Link href="/studies" className="btn-primary mt-8">
        Back to your studies
      </Link>
    </main>
  );
}
