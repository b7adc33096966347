"use client";
import { useActionState } from "react";
import { acceptInvitationAction, type AcceptState } from "@/app/invite/[token]/actions";

export function InviteAccept({ token, studyName }: { token: string; studyName: string }) {
  const [state, formAction, pending] = useActionState<AcceptState, FormData>(acceptInvitationAction, {});
  return (
    <form action={formAction} className="mt-6 space-y-3">
      <input type="hidden" name="token" value={token} />
      {state.message && (
        <p
          className="rounded-lg border border-red-200 bg-red-50 px-3 py-2 text-sm text-red-800 dark:border-red-900 dark:bg-red-950 dark:text-red-200"
          role="alert"
          data-testid="invite-error"
        >
          {state.message}
        </p>
      )}
      <button type="submit" className="btn-primary w-full" disabled={pending} data-testid="accept-invite">
        {pending ? "Joining…" : `Accept and open ${studyName}`}
      </button>
    </form>
  );
}
