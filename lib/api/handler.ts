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
export function route<P = Record<string, string>>(handler: (request: Request, params: P) => Promise<Response>) {
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

/**
 * The body of a request, refused with 413 as soon as it passes `maxBytes`: first by its declared Content-Length, then
 * while streaming (a chunked body, or one whose Content-Length understates it, is cut off without being buffered whole).
 */
export function cappedBody(request: Request, maxBytes: number, tooLarge: () => ApiError): ReadableStream<Uint8Array> | null {
  const declared = Number(request.headers.get("content-length") ?? "NaN");
  if (Number.isFinite(declared) && declared > maxBytes) throw tooLarge();
  if (!request.body) return null;
  let seen = 0;
  return request.body.pipeThrough(
    new TransformStream<Uint8Array, Uint8Array>({
      transform(chunk, controller) {
        seen += chunk.byteLength;
        if (seen > maxBytes) controller.error(tooLarge());
        else controller.enqueue(chunk);
      },
    }),
  );
}

/** Reads a capped body completely; the ApiError of the cap (413) comes through as is. */
export async function readCapped(request: Request, maxBytes: number, tooLarge: () => ApiError): Promise<Uint8Array> {
  const stream = cappedBody(request, maxBytes, tooLarge);
  if (!stream) return new Uint8Array(0);
  const reader = stream.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    let next: ReadableStreamReadResult<Uint8Array>;
    try {
      next = await reader.read();
    } catch (error) {
      if (error instanceof ApiError) throw error;
      throw new ApiError(400, "The request body could not be read.");
    }
    if (next.done) break;
    chunks.push(next.value);
    total += next.value.byteLength;
  }
  const bytes = new Uint8Array(total);
  let offset = 0;
  for (const chunk of chunks) {
    bytes.set(chunk, offset);
    offset += chunk.byteLength;
  }
  return bytes;
}

/**
 * A JSON body (at most `maxBytes`). Policy for unknown fields: they are ignored — every route validates the body with
 * a zod object schema, which drops keys it does not name, so an extra field is never stored or acted on.
 */
export async function readJson(request: Request, maxBytes = 1_000_000): Promise<unknown> {
  const bytes = await readCapped(request, maxBytes, () => new ApiError(413, `The request body is larger than ${maxBytes} bytes.`));
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw new ApiError(400, "The request body is not UTF-8 text.");
  }
  if (!text) throw new ApiError(400, "The request body is empty; JSON was expected.");
  try {
    return JSON.parse(text);
  } catch {
    throw new ApiError(400, "The request body is not valid JSON.");
  }
}
