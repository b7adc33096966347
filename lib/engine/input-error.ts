import type { RejectedRow } from "./types";

/** most problem rows listed one by one (all are counted) */
export const MAX_REJECTED_LISTED = 200;

/** An input file that cannot be used as it is: every problem with its row and column. */
export class PickInputError extends Error {
  readonly rejected: RejectedRow[];
  readonly truncated: boolean;
  constructor(message: string, rejected: RejectedRow[], truncated = false) {
    super(message);
    this.name = "PickInputError";
    this.rejected = rejected;
    this.truncated = truncated;
  }
}
