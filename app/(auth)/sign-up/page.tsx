import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { AuthForm } from "@/components/auth/AuthForm";
import { getSessionUser } from "@/lib/auth/session";
import { signUpAction } from "../actions";

export const metadata: Metadata = { title: "Create account" };

export default async function SignUpPage({ searchParams }: { searchParams: Promise<{ next?: string; email?: string }> }) {
  const { next, email } = await searchParams;
  const prefill = typeof email === "string" && email.length <= 200 ? email : undefined;
  if (await getSessionUser()) redirect(next?.startsWith("/") && !next.startsWith("//") ? next : "/studies");
  return (
    <>
      <h1 className="mb-1 text-xl font-semibold">Create your account</h1>
      <p className="mb-6 text-sm text-slate-600 dark:text-slate-400">Start a study, upload throw picks, invite your team.</p>
      <AuthForm mode="sign-up" action={signUpAction} next={next} email={prefill} />
    </>
  );
}
