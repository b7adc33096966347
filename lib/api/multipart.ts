import "server-only";
import { ApiError } from "./errors";
import { readMultipartOffThread } from "@/lib/analysis/worker-pool";
import { NOT_A_FORM, UploadProblem } from "@/lib/analysis/upload-parse";
import { readCapped } from "./handler";

/** Room for the multipart boundaries and the small form fields beside the file. */
const FORM_OVERHEAD_BYTES = 64 * 1024;

/**
 * Reads one uploaded file from a multipart body, refusing an oversized body before reading it: by its Content-Length,
 * or, when that is missing or wrong, as soon as the stream passes the limit (the rest is never buffered). The body is
 * only gathered here; the form is taken apart in the worker pool.
 */
export async function readUploadedFile(request: Request, maxBytes: number) {
  const limit = maxBytes + FORM_OVERHEAD_BYTES;
  const tooLarge = () => {
    const declared = Number(request.headers.get("content-length") ?? "NaN");
    const size = Number.isFinite(declared) && declared > limit ? `The upload is ${(declared / 1048576).toFixed(1)} MB; the` : "The upload is larger than the";
    return new ApiError(413, `${size} limit is ${(maxBytes / 1048576).toFixed(0)} MB.`);
  };
  const contentType = request.headers.get("content-type") ?? "";
  if (!/^multipart\/form-data/i.test(contentType)) throw new ApiError(400, NOT_A_FORM);
  const body = await readCapped(request, limit, tooLarge);
  let form: Awaited<ReturnType<typeof readMultipartOffThread>>;
  try {
    form = await readMultipartOffThread({ output: "multipart", body, contentType });
  } catch (error) {
    if (error instanceof UploadProblem) throw new ApiError(error.status, error.message);
    throw error;
  }
  const { file, fields } = form;
  if (!file) throw new ApiError(400, "No file was attached (form field 'file').", { fieldErrors: { file: ["Choose a CSV file."] } });
  if (file.size > maxBytes) throw new ApiError(413, `${file.name} is larger than the ${(maxBytes / 1048576).toFixed(0)} MB limit.`);
  return { file: { name: file.name || "picks.csv", bytes: file.bytes }, fields };
}
