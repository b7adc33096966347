import type { Metadata } from "next";
import { NotifySettingsForm } from "@/components/settings/NotifySettingsForm";
import { pageUser } from "@/lib/pages";
import { getNotifyMode } from "@/lib/pins/notify";

export const metadata: Metadata = { title: "Settings" };

export default async function SettingsPage() {
  const user = await pageUser("/settings");
  const mode = await getNotifyMode(user.id);
  return (
    <main className="mx-auto max-w-2xl px-6 py-10">
      <p className="text-xs text-slate-500">
        Signed in as <span className="font-medium text-slate-700 dark:text-slate-300">{user.email}</span>
      </p>
      <h1 className="mt-1 text-2xl font-semibold">Settings</h1>
      <section className="card mt-6 p-6">
        <h2 className="font-semibold">E-mail about pinned notes</h2>
        <p className="mt-1 text-sm text-slate-600 dark:text-slate-400">
          Slipfield e-mails you when someone replies to your pin, mentions you with @, or resolves your pin.
        </p>
        <NotifySettingsForm initialMode={mode} />
      </section>
    </main>
  );
}
