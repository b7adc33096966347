import type { Metadata } from "next";
import { StudiesBoard } from "@/components/studies/StudiesBoard";
import { pageUser } from "@/lib/pages";

export const metadata: Metadata = { title: "Studies" };

export default async function StudiesPage() {
  const user = await pageUser("/studies");
  return (
    <main className="mx-auto max-w-6xl px-6 py-10">
      <p className="text-xs text-slate-500">
        Signed in as <span className="font-medium text-slate-700 dark:text-slate-300">{user.email}</span>
      </p>
      <h1 className="mt-1 text-2xl font-semibold">Your studies</h1>
      <StudiesBoard />
    </main>
  );
}
