// The floor of "server start": a bare Node process that opens PGlite on the data dir and answers
// one query, nothing else (no tsx, no app). Prints "open" when the query has answered.
import { PGlite } from '@electric-sql/pglite';

const db = await PGlite.create({ dataDir: process.argv[2] });
await db.query('select 1');
process.stdout.write('open\n');
await db.close();
