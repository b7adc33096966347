import { NextResponse } from "next/server";
import { route } from "@/lib/api/handler";
import { recordAudit } from "@/lib/audit";
import { requireDigestCaller } from "@/lib/outbox";
import { runDigest } from "@/lib/pins/notify";

/**
 * Sends the e-mail digest now: one e-mail per person with everything queued for them.
 * Callers: a scheduler with the header `x-slipfield-digest-secret: $SLIPFIELD_DIGEST_SECRET`, or a signed-in study owner.
 */
export const POST = route(async (request) => {
  const caller = await requireDigestCaller(request);
  const summary = await runDigest();
  await recordAudit({ userId: caller.kind === "owner" ? caller.user.id : null, action: "digest.run", details: { ...summary, via: caller.kind } });
  return NextResponse.json(summary);
});
