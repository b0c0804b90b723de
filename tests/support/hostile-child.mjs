// Child process of tests/db/hostile.test.ts: imports one log into a zone of a store file and prints one
// JSON line with the outcome and this process's peak resident memory (so the parent can bound it).
import { register } from 'tsx/esm/api';

register();
const { openStore, importLog, ImportError } = await import('../../db/index.ts');
const [dbFile, csvFile, zoneId] = process.argv.slice(2);
const store = openStore(dbFile);
let out;
try {
  const r = await importLog(store, csvFile, { zoneId: Number(zoneId) });
  out = { ok: true, rowsAccepted: r.rowsAccepted };
} catch (err) {
  if (!(err instanceof ImportError)) throw err;
  out = { ok: false, message: err.message, line: err.line ?? null, column: err.column ?? null };
} finally {
  store.close();
}
process.stdout.write(`${JSON.stringify({ ...out, maxRssMB: Math.round(process.resourceUsage().maxRSS / 1024) })}\n`);
