// Plain CSV writing and reading for exports: comma-separated, header row, numbers written with full precision
// (shortest round-trip form), empty cell for "no data" (NaN). Text cells are quoted when they need it.

export type CsvCell = number | string | null | undefined;

function cell(value: CsvCell): string {
  if (value === null || value === undefined) return "";
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "";
  return /[",\n\r]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

/** CSV text; `comments` go first, each on a line of its own starting with "# " (e.g. the coordinate reference). */
export function toCsv(header: string[], rows: Iterable<CsvCell[]>, comments: string[] = []): string {
  const lines = [...comments.map((comment) => `# ${comment.replace(/[\r\n]+/g, " ")}`), header.map(cell).join(",")];
  for (const row of rows) lines.push(row.map(cell).join(","));
  return lines.join("\n") + "\n";
}

/** Reads a CSV written by toCsv (quoted cells allowed; leading "#" comment lines skipped): header and rows of strings. */
export function readCsv(text: string): { header: string[]; rows: string[][] } {
  while (text.startsWith("#")) {
    const end = text.indexOf("\n");
    text = end < 0 ? "" : text.slice(end + 1);
  }
  const records: string[][] = [];
  let row: string[] = [];
  let field = "";
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (quoted) {
      if (ch === '"' && text[i + 1] === '"') {
        field += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else field += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === ",") {
      row.push(field);
      field = "";
    } else if (ch === "\n" || ch === "\r") {
      if (ch === "\r" && text[i + 1] === "\n") i++;
      row.push(field);
      records.push(row);
      row = [];
      field = "";
    } else field += ch;
  }
  if (field !== "" || row.length) {
    row.push(field);
    records.push(row);
  }
  const [header = [], ...rows] = records;
  return { header, rows };
}

/** Numeric column by name from readCsv output; empty cells become NaN. */
export function numericColumn(table: { header: string[]; rows: string[][] }, name: string): number[] {
  const index = table.header.indexOf(name);
  if (index < 0) throw new Error(`The CSV has no column "${name}".`);
  return table.rows.map((row) => (row[index] === "" || row[index] === undefined ? NaN : Number(row[index])));
}

/** File-name-safe form of a fault name. */
export function fileStem(name: string): string {
  return (
    name
      .trim()
      .replace(/[^\w.-]+/g, "-")
      .replace(/^-+|-+$/g, "") || "fault"
  );
}
