// `npm run db:seed`: the invented demo studio into the database named by DATABASE_URL.
import { databaseFile, getDb } from "../client";
import { AlreadySeededError, DEMO_ACCOUNTS, DEMO_PASSWORD, seedDemo } from "./demo";

try {
  const result = await seedDemo(getDb());
  console.log(`Seeded the demo studio (invented data) into ${databaseFile()}: ${result.pieces} pieces.`);
  console.log(`Demo accounts (password "${DEMO_PASSWORD}"): ${Object.values(DEMO_ACCOUNTS).map((a) => a.email).join(", ")}`);
  console.log("Unregistered pieces and their registration codes:");
  for (const { title, code } of result.codes) console.log(`  ${code}  ${title}`);
} catch (e) {
  if (e instanceof AlreadySeededError) {
    console.log(e.message);
  } else {
    console.error(e instanceof Error ? e.message : e);
    process.exit(1);
  }
}
