import "server-only";
import { eq } from "drizzle-orm";
import { z } from "zod";
import { getDb } from "@/db/client";
import { users } from "@/db/schema";
import { hashPassword, passwordSchema, verifyPassword } from "./password";
import { emailSchema } from "@/lib/contracts/people";
import { signInLimiter } from "@/lib/rate-limit";
import { recordAudit } from "@/lib/audit";

export const signUpSchema = z.object({
  name: z.string().trim().min(1, "Enter your name.").max(100, "Use at most 100 characters."),
  email: emailSchema,
  password: passwordSchema,
});

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, "Enter your password.").max(200),
});

export interface SessionUser {
  id: string;
  email: string;
  name: string;
}

export type SignUpResult = { ok: true; user: SessionUser } | { ok: false; fieldErrors: Record<string, string[]> };

export async function createUser(input: unknown): Promise<SignUpResult> {
  const parsed = signUpSchema.safeParse(input);
  if (!parsed.success) return { ok: false, fieldErrors: z.flattenError(parsed.error).fieldErrors };
  const db = await getDb();
  const existing = await db.query.users.findFirst({ where: eq(users.email, parsed.data.email) });
  if (existing) return { ok: false, fieldErrors: { email: ["An account with this e-mail already exists."] } };
  const [created] = await db
    .insert(users)
    .values({ name: parsed.data.name, email: parsed.data.email, passwordHash: await hashPassword(parsed.data.password) })
    .returning({ id: users.id, email: users.email, name: users.name });
  await recordAudit({ userId: created.id, action: "user.sign-up", target: created.email });
  return { ok: true, user: created };
}

export type CredentialCheck = { ok: true; user: SessionUser } | { ok: false; reason: "invalid" | "rate-limited" };

/** Checks e-mail + password with a per-address attempt limit (successful sign-in clears it). */
export async function checkCredentials(input: unknown): Promise<CredentialCheck> {
  const parsed = signInSchema.safeParse(input);
  if (!parsed.success) return { ok: false, reason: "invalid" };
  const key = parsed.data.email;
  if (!(await signInLimiter.attempt(key))) return { ok: false, reason: "rate-limited" };
  const db = await getDb();
  const user = await db.query.users.findFirst({ where: eq(users.email, parsed.data.email) });
  if (!user || !(await verifyPassword(parsed.data.password, user.passwordHash))) return { ok: false, reason: "invalid" };
  await signInLimiter.reset(key);
  return { ok: true, user: { id: user.id, email: user.email, name: user.name } };
}
