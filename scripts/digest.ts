// Sends the e-mail digest: one e-mail per person with every notification queued for them.
// npm run digest   (uses DATABASE_URL, or the PGlite data folder SLIPFIELD_DATA_DIR / ./data)
import { getDatabaseHandle } from "../db/client";
import { runDigest } from "../lib/pins/notify";

async function main() {
  const summary = await runDigest();
  console.log(
    `Digest sent: ${summary.emails} e-mail(s) carrying ${summary.notifications} notification(s); ${summary.dropped} dropped for people who turned e-mail off.`,
  );
  await (await getDatabaseHandle()).close();
}

main().catch((error: unknown) => {
  console.error(`Digest failed: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
});
