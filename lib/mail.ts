import "server-only";
import nodemailer from "nodemailer";
import { getDb } from "@/db/client";
import { outbox } from "@/db/schema";
import { htmlFromText } from "@/lib/mail-html";
import { config } from "@/lib/config";

export interface MailMessage {
  to: string;
  subject: string;
  text: string;
  html?: string;
  kind: "invitation" | "pin-reply" | "mention" | "pin-resolved" | "digest" | string;
  studyId?: string | null;
}

/** SMTP when SMTP_URL is set; otherwise nodemailer's JSON transport, which sends nothing (the local fake). */
function transport() {
  const globalForMail = globalThis as unknown as { slipfieldMail?: nodemailer.Transporter };
  const { SMTP_URL } = config();
  globalForMail.slipfieldMail ??= SMTP_URL ? nodemailer.createTransport(SMTP_URL) : nodemailer.createTransport({ jsonTransport: true });
  return globalForMail.slipfieldMail;
}

/**
 * Every message is kept in the outbox table (the development mailbox), then handed to the transport. A message
 * without its own HTML gets one made from its text (escaped; only links into this Slipfield clickable).
 */
export async function sendMail(message: MailMessage) {
  const db = await getDb();
  const html = message.html ?? htmlFromText(message.text, new URL(appUrl("/")).origin);
  const [stored] = await db
    .insert(outbox)
    .values({ to: message.to, subject: message.subject, text: message.text, html, kind: message.kind, studyId: message.studyId ?? null })
    .returning();
  await transport().sendMail({ from: config().MAIL_FROM, to: message.to, subject: message.subject, text: message.text, html });
  return stored;
}

export function appUrl(path: string) {
  const { SLIPFIELD_URL, PORT } = config();
  const base = SLIPFIELD_URL ?? `http://localhost:${PORT}`;
  return new URL(path, base).toString();
}
