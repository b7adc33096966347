import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { SharedViewpoint } from "@/components/collab/SharedViewpoint";
import { ApiError } from "@/lib/api/errors";
import { lookupLinkToken, publicViewpoint } from "@/lib/viewpoints";
import type { PublicViewpoint } from "@/lib/contracts/viewpoints";

// the token is a secret: keep it out of search engines and out of Referer headers to other sites
export const metadata: Metadata = { title: "Shared view", robots: { index: false, follow: false }, referrer: "no-referrer" };
export const dynamic = "force-dynamic";

const GONE = {
  revoked: ["This link was revoked", "The person who shared this view has turned the link off. Ask them for a new one if you still need it."],
  expired: ["This link has expired", "Shared views last for the time chosen when the link was made. Ask the person who shared it for a new link."],
} as const;

function LinkGone({ state }: { state: keyof typeof GONE }) {
  const [title, text] = GONE[state];
  return (
    <main className="mx-auto max-w-xl px-6 py-24 text-center" data-testid={`link-${state}`}>
      <p className="eyebrow">Shared view</p>
      <h1 className="mt-2 text-2xl font-semibold">{title}</h1>
      <p className="mt-3 text-slate-600 dark:text-slate-400">{text}</p>
    </main>
  );
}

/**
 * An unknown token is a 404 (app/v/[token]/not-found.tsx); a revoked or expired one shows why, and proxy.ts sends that
 * page with status 410 (a page cannot set its own status).
 */
export default async function ViewpointLinkPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const found = await lookupLinkToken(token);
  if (found.state === "not-found") notFound();
  if (found.state !== "active") return <LinkGone state={found.state} />;
  let data: PublicViewpoint;
  try {
    data = await publicViewpoint(token);
  } catch (error) {
    // revoked between the two reads
    const state = error instanceof ApiError ? (error.details as { state?: "not-found" | keyof typeof GONE } | undefined)?.state : undefined;
    if (state === "not-found") notFound();
    if (state) return <LinkGone state={state} />;
    throw error;
  }
  return <SharedViewpoint token={token} data={data} />;
}
