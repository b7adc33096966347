import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { pageUser } from "@/lib/pages";
import { listOutbox, mailStaysLocal, outboxEnabled, ownsAnyStudy } from "@/lib/outbox";

export const metadata: Metadata = { title: "Outbox" };

/** what each kind of e-mail is, in words */
const KIND_WORDS: Record<string, string> = {
  invitation: "invitation",
  "pin-reply": "reply to a note",
  mention: "mention",
  "pin-resolved": "note resolved",
  digest: "digest",
};

/** The local mailbox: e-mail the app has written (kept here, and sent only when SMTP_URL is set), for study owners: their studies' e-mail and their own. */
export default async function OutboxPage() {
  if (!outboxEnabled()) notFound();
  const user = await pageUser("/outbox");
  if (!(await ownsAnyStudy(user.id))) notFound();
  const messages = await listOutbox(user);
  return (
    <main className="mx-auto max-w-4xl px-6 py-10">
      <p className="eyebrow">Local mail</p>
      <h1 className="mt-1 text-2xl font-semibold">Outbox</h1>
      <p className="mt-2 text-sm text-slate-600 dark:text-slate-400" data-testid="outbox-intro">
        E-mails Slipfield has written for your studies and to you, newest first ({messages.length}
        {messages.length === 200 ? ", the latest 200" : ""}).{" "}
        {mailStaysLocal()
          ? "No mail server is configured (SMTP_URL is not set), so none of them left this machine: this page is where they can be read."
          : "A mail server is configured (SMTP_URL), so each of them was also sent."}
      </p>
      {messages.length === 0 ? (
        <p className="card mt-6 p-6 text-sm text-slate-500">No e-mail yet.</p>
      ) : (
        <ol className="mt-6 space-y-3">
          {messages.map((message) => (
            <li key={message.id} className="card p-4" data-testid="outbox-message">
              <div className="flex flex-wrap items-baseline justify-between gap-2">
                <h2 className="font-medium" data-testid="outbox-subject">
                  {message.subject}
                </h2>
                <time className="num text-xs text-slate-500" dateTime={message.createdAt.toISOString()}>
                  {message.createdAt.toISOString().replace("T", " ").slice(0, 19)} UTC
                </time>
              </div>
              <p className="mt-1 text-sm text-slate-600 dark:text-slate-400">
                To{" "}
                <span className="font-medium text-slate-800 dark:text-slate-200" data-testid="outbox-to">
                  {message.to}
                </span>
                <span className="ml-2 rounded bg-slate-100 px-1.5 py-0.5 text-xs dark:bg-slate-800">{KIND_WORDS[message.kind] ?? "e-mail"}</span>
              </p>
              <pre
                className="mt-3 max-h-72 overflow-auto whitespace-pre-wrap rounded-lg bg-slate-50 p-3 font-mono text-xs text-slate-800 dark:bg-slate-950 dark:text-slate-200"
                data-testid="outbox-body"
              >
                {message.text}
              </pre>
            </li>
          ))}
        </ol>
      )}
    </main>
  );
}
