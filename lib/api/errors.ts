import { z } from "zod";

/** A failure meant for the caller: becomes a JSON problem `{ error, details }` with this status. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
  }
}

export const unauthorized = () => new ApiError(401, "Sign in to continue.");
export const forbidden = (what = "do this") => new ApiError(403, `Your role in this study does not allow you to ${what}.`);
export const notFound = (what = "Not found") => new ApiError(404, what);

export function validationError(error: z.ZodError, where = "body") {
  const flat = z.flattenError(error);
  return new ApiError(400, `The request ${where} is not valid.`, { fieldErrors: flat.fieldErrors, formErrors: flat.formErrors });
}

export function parseWith<T>(schema: z.ZodType<T>, value: unknown, where = "body"): T {
  const result = schema.safeParse(value);
  if (!result.success) throw validationError(result.error, where);
  return result.data;
}
