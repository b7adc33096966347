import type { Metadata } from "next";
import Link from "next/link";
import { signOutAction } from "@/app/(auth)/actions";
import { InviteAccept } from "@/components/collab/InviteAccept";
import { getSessionUser } from "@/lib/auth/session";
import { lookupInvitation } from "@/lib/invitations";

export const metadata: Metadata = { title: "Invitation", robots: { index: false, follow: false } };
export const dynamic = "force-dynamic";

const ROLE_WORDS = {
  owner: "invite people, set roles and do everything else",
  interpreter: "upload pick sets, run analyses, pin comments and share viewpoints",
  reviewer: "pin comments, reply and share viewpoints",
  viewer: "see the faults, analyses, viewpoints and pins",
} as const;

function Shell({ children, testId }: { children: React.ReactNode; testId: string }) {
  return (
    <main className="mx-auto max-w-md px-6 py-16" data-testid={testId}>
      <div className="card p-6">{children}</div>
    </main>
  );
}

export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const invitation = await lookupInvitation(token);
  if (invitation.state !== "open") {
    const words = {
      "not-found": ["This invitation link is not valid", "Check that the whole link was copied, or ask the study owner to invite you again."],
      expired: ["This invitation has expired", "Invitations last a week. Ask the study owner to invite you again."],
      used: ["This invitation has already been used", "If you accepted it, the study is in your list of studies."],
    }[invitation.state];
    return (
      <Shell testId={`invite-${invitation.state}`}>
        <p className="eyebrow">Invitation</p>
        <h1 className="mt-2 text-xl font-semibold">{words[0]}</h1>
        <p className="mt-3 text-sm text-slate-600 dark:text-slate-400">{words[1]}</p>
        <Link href="/studies" className="btn-quiet mt-6">
          Your studies
        </Link>
      </Shell>
    );
  }

  const user = await getSessionUser();
  const back = `/invite/${token}`;
  const query = (next: string) => `?next=${encodeURIComponent(next)}&email=${encodeURIComponent(invitation.email)}`;
  return (
    <Shell testId="invite-open">
      <p className="eyebrow">Invitation</p>
      <h1 className="mt-2 text-xl font-semibold" data-testid="invite-study">
        Join “{invitation.studyName}”
      </h1>
      <p className="mt-3 text-sm text-slate-600 dark:text-slate-400">
        {invitation.invitedByName ?? "A study owner"} invited <span className="font-medium">{invitation.email}</span> as{" "}
        <span className="font-medium" data-testid="invite-role">
          {invitation.role}
        </span>
        : you will be able to {ROLE_WORDS[invitation.role]}.
      </p>
      <p className="mt-1 text-xs text-slate-500">The link works once and expires on {invitation.expiresAt.toUTCString()}.</p>
      {!user ? (
        <div className="mt-6 space-y-2">
          <Link href={`/sign-in${query(back)}`} className="btn-primary w-full" data-testid="invite-sign-in">
            Sign in to accept
          </Link>
          <Link href={`/sign-up${query(back)}`} className="btn-quiet w-full" data-testid="invite-sign-up">
            Create an account with {invitation.email}
          </Link>
        </div>
      ) : user.email.toLowerCase() !== invitation.email.toLowerCase() ? (
        <div className="mt-6 space-y-3" data-testid="invite-wrong-account">
          <p className="text-sm">
            You are signed in as <span className="font-medium">{user.email}</span>, but this invitation is for{" "}
            <span className="font-medium">{invitation.email}</span>. Sign out, then open this link again and sign in with the invited address.
          </p>
          <form action={signOutAction}>
            <button type="submit" className="btn-quiet">
              Sign out
            </button>
          </form>
        </div>
      ) : (
        <InviteAccept token={token} studyName={invitation.studyName} />
      )}
    </Shell>
  );
}
