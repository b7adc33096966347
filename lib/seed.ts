import "server-only";
import { getDb } from "@/db/client";
import { memberships, studies, users } from "@/db/schema";
import { confirmUpload } from "@/lib/analysis/uploads";
import { runAnalysis } from "@/lib/analysis/runner";
import { hashPassword } from "@/lib/auth/password";
import { createFault } from "@/lib/studies";
import {
  DEMO_ACCOUNTS,
  DEMO_COORDINATE_REFERENCE,
  DEMO_CUTOFF_FILE,
  DEMO_FAULTS,
  DEMO_PASSWORD,
  DEMO_STRATIGRAPHY,
  DEMO_VELOCITY,
  demoCsv,
  demoCutoffCsv,
} from "@/lib/demo";
import { checkCoordinateReference } from "@/lib/crs";
import { saveStratigraphy } from "@/lib/seal/service";

/**
 * Seeds the Quillon Graben demo: four accounts (one per role), the study with its stratigraphy table, both faults with
 * analysed pick sets. QG-1 first gets the pick set derived from its cut-off lines (version 1), then its denser picks.
 */
export async function seedDemo() {
  const db = await getDb();
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  const accounts = await db
    .insert(users)
    .values(DEMO_ACCOUNTS.map((account) => ({ email: account.email, name: account.name, passwordHash })))
    .returning();
  const byEmail = new Map(accounts.map((account) => [account.email, account]));
  const owner = byEmail.get("owner@quillon.test")!;
  const interpreter = byEmail.get("interpreter@quillon.test")!;
  const [study] = await db
    .insert(studies)
    .values({
      name: "Quillon Graben CO2 screen",
      description: "Fictional offshore basin screened for CO2 storage: fault geometry, tip lines and relay integrity around the storage closure. Demo data.",
      createdBy: owner.id,
      // the invented basin sits in UTM zone 31N offshore; z is elevation above mean sea level
      coordinateReference: checkCoordinateReference(DEMO_COORDINATE_REFERENCE),
    })
    .returning();
  await db.insert(memberships).values(DEMO_ACCOUNTS.map((account) => ({ studyId: study.id, userId: byEmail.get(account.email)!.id, role: account.role })));
  const access = { user: { id: interpreter.id, email: interpreter.email, name: interpreter.name }, studyId: study.id, role: "interpreter" as const };
  await saveStratigraphy(access, { units: DEMO_STRATIGRAPHY });
  for (const demo of DEMO_FAULTS) {
    const fault = await createFault(access, { name: demo.name, description: demo.description, sense: "normal", inversion: false });
    if (demo.name === "QG-1") {
      const cutoffs = new TextEncoder().encode(demoCutoffCsv());
      const derived = await confirmUpload(
        { ...access, faultId: fault.id },
        { name: DEMO_CUTOFF_FILE, bytes: cutoffs },
        { units: "m", dropBadRows: false, problemPage: 0, velocityModel: DEMO_VELOCITY },
      );
      await runAnalysis(derived.analysisId);
    }
    const bytes = new TextEncoder().encode(demoCsv(demo.name));
    const { analysisId } = await confirmUpload(
      { ...access, faultId: fault.id },
      { name: demo.fileName, bytes },
      { units: "m", dropBadRows: false, problemPage: 0 },
    );
    await runAnalysis(analysisId);
  }
  return { studyId: study.id };
}
