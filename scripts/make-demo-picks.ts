// Writes the invented Quillon Graben demo pick files to public/demo/ (npm run seed-data).
import { mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import { DEMO_FAULTS, demoCsv } from "../lib/demo";

const folder = path.join(process.cwd(), "public", "demo");
mkdirSync(folder, { recursive: true });
for (const fault of DEMO_FAULTS) {
  const file = path.join(folder, fault.fileName);
  writeFileSync(file, demoCsv(fault.name));
  console.log(`wrote ${path.relative(process.cwd(), file)}`);
}
