import "server-only";
import { NextResponse } from "next/server";
import { ApiError } from "./errors";

type RouteContext<P> = { params: Promise<P> };

export function problem(status: number, error: string, details?: unknown) {
  return NextResponse.json(details === undefined ? { error } : { error, details }, { status });
}

/** Mutations must come from our own origin (CSRF defence beside SameSite cookies). */
function isCrossSiteMutation(request: Request): boolean {
  if (["GET", "HEAD", "OPTIONS"].includes(request.method)) return false;
  const origin = request.headers.get("origin");
  if (!origin) return false;
  const host = request.headers.get("x-forwarded-host") ?? request.headers.get("host");
  try {
    return new URL(origin).host !== host;
  } catch {
    return true;
  }
}

/** Wraps a route handler: JSON problems for known failures, a bare 500 (never a stack trace) for the rest. */
export function route<P = Record<string, string>>(
  handler: (request: Request, params: P) => Promise<Response>,
) {
  return async (request: Request, context: RouteContext<P>): Promise<Response> => {
    try {
      if (isCrossSiteMutation(request)) return problem(403, "Cross-site request refused.");
      const params = context?.params ? await context.params : ({} as P);
      return await handler(request, params);
    } catch (error) {
      if (error instanceof ApiError) return problem(error.status, error.message, error.details);
      console.error("[slipfield] unhandled route error:", error);
      return problem(500, "Something went wrong on the server. The error has been logged.");
    }
  };
}

export async function readJson(request: Request, maxBytes = 1_000_000): Promise<unknown> {
  const length = Number(request.headers.get("content-length") ?? "0");
  if (length > maxBytes) throw new ApiError(413, `The request body is larger than ${maxBytes} bytes.`);
  const text = await request.text();
  if (text.length > maxBytes) throw new ApiError(413, `The request body is larger than ${maxBytes} bytes.`);
  if (!text) throw new ApiError(400, "The request body is empty; JSON was expected.");
  try {
    return JSON.parse(text);
  } catch {
    throw new ApiError(400, "The request body is not valid JSON.");
  }
}
