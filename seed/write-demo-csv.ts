import { writeFileSync } from "node:fs";
import { demoHistoryCsv } from "./history";

// Writes the demo history as a CSV file, e.g. to try the upload screen: npm run seed:csv -- /tmp/larkspur.csv
const target = process.argv[2] ?? "larkspur-weekly-history.csv";
writeFileSync(target, demoHistoryCsv());
console.log(`Wrote ${target}`);
