"use client";
import Link from "next/link";
import { useActionState } from "react";
import type { AuthFormState } from "@/app/(auth)/actions";
import { FieldError } from "@/components/ui/FieldError";

interface Props {
  mode: "sign-in" | "sign-up";
  action: (state: AuthFormState, formData: FormData) => Promise<AuthFormState>;
  next?: string;
  /** pre-filled address, e.g. from an invitation link */
  email?: string;
}

export function AuthForm({ mode, action, next, email }: Props) {
  const [state, formAction, pending] = useActionState(action, {});
  const errors = state.fieldErrors ?? {};
  const signUp = mode === "sign-up";
  // keep the way back (e.g. to an invitation) when switching between sign-in and sign-up
  const carry = new URLSearchParams({ ...(next ? { next } : {}), ...(email ? { email } : {}) }).toString();
  const suffix = carry ? `?${carry}` : "";
  return (
    <form action={formAction} className="space-y-4" noValidate>
      {next && <input type="hidden" name="next" value={next} />}
      {state.message && (
        <div
          className="rounded-lg border border-red-200 bg-red-50 px-3 py-2 text-sm text-red-800 dark:border-red-900 dark:bg-red-950 dark:text-red-200"
          data-testid="form-message"
        >
          {state.message}
        </div>
      )}
      {signUp && (
        <div>
          <label htmlFor="name" className="label">
            Name
          </label>
          <input id="name" name="name" className="field" autoComplete="name" defaultValue={state.values?.name} aria-invalid={!!errors.name} />
          <FieldError errors={errors.name} />
        </div>
      )}
      <div>
        <label htmlFor="email" className="label">
          E-mail
        </label>
        <input
          id="email"
          name="email"
          type="email"
          className="field"
          autoComplete="email"
          defaultValue={state.values?.email ?? email}
          aria-invalid={!!errors.email}
        />
        <FieldError errors={errors.email} />
      </div>
      <div>
        <label htmlFor="password" className="label">
          Password
        </label>
        <input
          id="password"
          name="password"
          type="password"
          className="field"
          autoComplete={signUp ? "new-password" : "current-password"}
          aria-invalid={!!errors.password}
        />
        {signUp && !errors.password && <p className="mt-1 text-xs text-slate-500">At least 10 characters, with a letter and a digit.</p>}
        <FieldError errors={errors.password} />
      </div>
      <button type="submit" className="btn-primary w-full" disabled={pending}>
        {pending ? "One moment…" : signUp ? "Create account" : "Sign in"}
      </button>
      <p className="text-center text-sm text-slate-600 dark:text-slate-400">
        {signUp ? (
          <>
            Already have an account?{" "}
            <Link className="font-medium text-slip-700 hover:underline dark:text-slip-300" href={`/sign-in${suffix}`}>
              Sign in
            </Link>
          </>
        ) : (
          <>
            New to Slipfield?{" "}
            <Link className="font-medium text-slip-700 hover:underline dark:text-slip-300" href={`/sign-up${suffix}`}>
              Create an account
            </Link>
          </>
        )}
      </p>
    </form>
  );
}
