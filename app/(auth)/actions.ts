"use server";
import { AuthError } from "next-auth";
import { z } from "zod";
import { signIn, signOut } from "@/lib/auth";
import { revokeCurrentSession } from "@/lib/auth/session";
import { createUser, signInSchema } from "@/lib/auth/users";

export interface AuthFormState {
  message?: string;
  fieldErrors?: Record<string, string[] | undefined>;
  values?: { name?: string; email?: string };
}

function safeRedirect(target: FormDataEntryValue | null): string {
  const value = typeof target === "string" ? target : "";
  return value.startsWith("/") && !value.startsWith("//") ? value : "/studies";
}

export async function signInAction(_previous: AuthFormState, formData: FormData): Promise<AuthFormState> {
  const input = { email: formData.get("email"), password: formData.get("password") };
  const parsed = signInSchema.safeParse(input);
  const values = { email: typeof input.email === "string" ? input.email : "" };
  if (!parsed.success) return { fieldErrors: z.flattenError(parsed.error).fieldErrors, values };
  try {
    await signIn("credentials", { ...parsed.data, redirectTo: safeRedirect(formData.get("next")) });
  } catch (error) {
    if (error instanceof AuthError) {
      const code = (error as AuthError & { code?: string }).code;
      return {
        message:
          code === "too_many_attempts" ? "Too many sign-in attempts for this address. Wait five minutes and try again." : "E-mail or password is not right.",
        values,
      };
    }
    throw error;
  }
  return {};
}

export async function signUpAction(_previous: AuthFormState, formData: FormData): Promise<AuthFormState> {
  const input = { name: formData.get("name"), email: formData.get("email"), password: formData.get("password") };
  const values = { name: String(input.name ?? ""), email: String(input.email ?? "") };
  const result = await createUser(input);
  if (!result.ok) return { fieldErrors: result.fieldErrors, values };
  await signIn("credentials", { email: result.user.email, password: input.password, redirectTo: safeRedirect(formData.get("next")) });
  return {};
}

export async function signOutAction() {
  await revokeCurrentSession();
  await signOut({ redirectTo: "/" });
}
