// Honest statuses for viewpoint links. A page cannot set its HTTP status, and a rewrite from here cannot either, so
// for /v/<token> this asks the token route whether the link still works; a revoked or expired link's page (the
// link page itself, rendered by the app with its reason) is then sent with status 410 Gone. Unknown tokens need
// nothing here: the page answers 404 itself (notFound()). Active links go straight through.
import { randomBytes } from "node:crypto";
import { NextResponse, type NextRequest } from "next/server";
import { config as settings } from "@/lib/config";

// marks the proxy's own request for the page, so it is not checked twice; unguessable, so nobody else can skip the check
const INNER_HEADER = "x-slipfield-link-page";
const INNER_SECRET = randomBytes(16).toString("hex");

/** This server's own address (next start records it when it starts listening). */
function ownOrigin(): string | null {
  if (process.env.__NEXT_PRIVATE_ORIGIN) return process.env.__NEXT_PRIVATE_ORIGIN;
  return process.env.PORT ? `http://127.0.0.1:${settings().PORT}` : null;
}

export async function proxy(request: NextRequest) {
  if (request.headers.get(INNER_HEADER) === INNER_SECRET) return NextResponse.next();
  // client-side navigations fetch the page's data, not its HTML: leave those to the page
  if (request.headers.has("rsc") || request.headers.has("next-router-prefetch")) return NextResponse.next();
  const origin = ownOrigin();
  const token = request.nextUrl.pathname.split("/")[2] ?? "";
  if (!origin || !token) return NextResponse.next();
  try {
    const state = await fetch(`${origin}/api/v/${encodeURIComponent(token)}/state`, { cache: "no-store" });
    if (state.status !== 410) return NextResponse.next();
    const page = await fetch(`${origin}${request.nextUrl.pathname}`, {
      cache: "no-store",
      headers: {
        [INNER_HEADER]: INNER_SECRET,
        cookie: request.headers.get("cookie") ?? "",
        "accept-language": request.headers.get("accept-language") ?? "",
      },
    });
    return new NextResponse(await page.text(), {
      status: 410,
      headers: {
        "content-type": page.headers.get("content-type") ?? "text/html; charset=utf-8",
        "cache-control": "no-store",
        "x-robots-tag": "noindex",
      },
    });
  } catch {
    // the check itself failed: the page still shows the link's state, with the default status
    return NextResponse.next();
  }
}

export const config = { matcher: "/v/:token" };
