import { route } from "@/lib/api/handler";
import { publicDisplay } from "@/lib/viewpoints";

type Params = { token: string };

/** The display payload of the fault behind the token (see lib/display/payload.ts); checked on every request so revoking takes effect at once. */
export const GET = route<Params>(async (_request, { token }) => {
  const display = await publicDisplay(token);
  return new Response(Buffer.from(display), {
    headers: { "content-type": "application/octet-stream", "cache-control": "no-store", "x-robots-tag": "noindex" },
  });
});
