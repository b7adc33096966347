// Writes the invented Quillon Graben demo files to public/demo/ (npm run seed-data): the pick files and QG-1's cut-off lines.
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import { DEMO_CUTOFF_FILE, DEMO_FAULTS, demoCsv, demoCutoffCsv } from "../lib/demo";

const folder = path.join(process.cwd(), "public", "demo");
mkdirSync(folder, { recursive: true });
for (const fault of DEMO_FAULTS) {
  const file = path.join(folder, fault.fileName);
  writeFileSync(file, demoCsv(fault.name));
  console.log(`wrote ${path.relative(process.cwd(), file)}`);
}
const cutoffs = path.join(folder, DEMO_CUTOFF_FILE);
writeFileSync(cutoffs, demoCutoffCsv());
console.log(`wrote ${path.relative(process.cwd(), cutoffs)} (two-way time: v0 = 1800 m/s, k = 0.6 1/s)`);
