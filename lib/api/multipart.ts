import "server-only";
import { ApiError } from "./errors";
import { cappedBody } from "./handler";

/** Room for the multipart boundaries and the small form fields beside the file. */
const FORM_OVERHEAD_BYTES = 64 * 1024;

/**
 * Reads one uploaded file from a multipart body, refusing an oversized body before reading it: by its Content-Length,
 * or, when that is missing or wrong, as soon as the stream passes the limit (the rest is never buffered).
 */
export async function readUploadedFile(request: Request, maxBytes: number) {
  const limit = maxBytes + FORM_OVERHEAD_BYTES;
  const tooLarge = () => {
    const declared = Number(request.headers.get("content-length") ?? "NaN");
    const size = Number.isFinite(declared) && declared > limit ? `The upload is ${(declared / 1048576).toFixed(1)} MB; the` : "The upload is larger than the";
    return new ApiError(413, `${size} limit is ${(maxBytes / 1048576).toFixed(0)} MB.`);
  };
  const body = cappedBody(request, limit, tooLarge);
  let form: FormData;
  try {
    if (!body) throw new Error("no body");
    form = await new Request(request.url, { method: "POST", headers: request.headers, body, duplex: "half" } as RequestInit).formData();
  } catch (error) {
    if (error instanceof ApiError) throw error;
    if ((error as { cause?: unknown })?.cause instanceof ApiError) throw (error as { cause: ApiError }).cause;
    throw new ApiError(400, "Send the picks as a multipart form with a 'file' field.");
  }
  const file = form.get("file");
  if (!(file instanceof File)) throw new ApiError(400, "No file was attached (form field 'file').", { fieldErrors: { file: ["Choose a CSV file."] } });
  if (file.size > maxBytes) throw new ApiError(413, `${file.name} is larger than the ${(maxBytes / 1048576).toFixed(0)} MB limit.`);
  const fields: Record<string, string> = {};
  for (const [key, value] of form.entries()) if (typeof value === "string") fields[key] = value;
  return { file: { name: file.name || "picks.csv", bytes: new Uint8Array(await file.arrayBuffer()) }, fields };
}
