import "server-only";
import { ApiError } from "./errors";

/** Reads one uploaded file from a multipart body, refusing oversized bodies before reading them. */
export async function readUploadedFile(request: Request, maxBytes: number) {
  const declared = Number(request.headers.get("content-length") ?? "NaN");
  if (Number.isFinite(declared) && declared > maxBytes + 64 * 1024) {
    throw new ApiError(413, `The upload is ${(declared / 1048576).toFixed(1)} MB; the limit is ${(maxBytes / 1048576).toFixed(0)} MB.`);
  }
  let form: FormData;
  try {
    form = await request.formData();
  } catch {
    throw new ApiError(400, "Send the picks as a multipart form with a 'file' field.");
  }
  const file = form.get("file");
  if (!(file instanceof File)) throw new ApiError(400, "No file was attached (form field 'file').", { fieldErrors: { file: ["Choose a CSV file."] } });
  if (file.size > maxBytes) throw new ApiError(413, `${file.name} is larger than the ${(maxBytes / 1048576).toFixed(0)} MB limit.`);
  const fields: Record<string, string> = {};
  for (const [key, value] of form.entries()) if (typeof value === "string") fields[key] = value;
  return { file: { name: file.name || "picks.csv", bytes: new Uint8Array(await file.arrayBuffer()) }, fields };
}
