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

/** Problems of a file as they are found: every one counted, the first MAX_REJECTED_LISTED kept to list. */
export function problemList() {
  const rejected: RejectedRow[] = [];
  let count = 0;
  return {
    rejected,
    reject(row: RejectedRow) {
      count++;
      if (rejected.length < MAX_REJECTED_LISTED) rejected.push(row);
    },
    get count() {
      return count;
    },
  };
}

/** "3 problems in the pick file: row 4, column throw: …; …" with at most ten listed. */
export function summariseProblems(list: RejectedRow[], total: number, file: string): string {
  const shown = list.slice(0, 10).map((r) => `row ${r.row}, column ${r.column}: ${r.reason}`);
  const more = total > shown.length ? `; and ${total - shown.length} more` : "";
  return `${total} problem${total === 1 ? "" : "s"} in the ${file}: ${shown.join("; ")}${more}`;
}
