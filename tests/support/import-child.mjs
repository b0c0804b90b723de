// Child process of the crash-safety test: imports one log into a zone and says when it starts and ends.
import { register } from 'tsx/esm/api';

register();
const { openStore, importLog } = await import('../../db/index.ts');
const [dbFile, csvFile] = process.argv.slice(2);
const store = openStore(dbFile);
const zone = store.getOrCreateZone('Crash site', 'Zone');
process.stdout.write('start\n');
const r = await importLog(store, csvFile, { zoneId: zone.id });
store.close();
process.stdout.write(`done ${r.rowsAccepted}\n`);
