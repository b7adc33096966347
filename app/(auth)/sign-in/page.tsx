import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { AuthForm } from "@/components/auth/AuthForm";
import { getSessionUser } from "@/lib/auth/session";
import { signInAction } from "../actions";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ next?: string; email?: string }> }) {
  const { next, email } = await searchParams;
  const prefill = typeof email === "string" && email.length <= 200 ? email : undefined;
  if (await getSessionUser()) redirect(next?.startsWith("/") && !next.startsWith("//") ? next : "/studies");
  return (
    <>
      <h1 className="mb-1 text-xl font-semibold">Sign in</h1>
      <p className="mb-6 text-sm text-slate-600 dark:text-slate-400">Open your studies and fault surfaces.</p>
      <AuthForm mode="sign-in" action={signInAction} next={next} email={prefill} />
    </>
  );
}
