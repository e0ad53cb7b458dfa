/**
 * `npm run seed:large [-- --scale N] [-- --force]`: the demo business with ten busy years of
 * history (tests/bench/seed-large-generator.ts) in its own data dir, `.vanbay-large/` or
 * VANBAY_LARGE_DIR. A dir that already holds a finished seed is left alone; `--force` rebuilds.
 */
import { existsSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { parseArgs } from 'node:util';
import { PROJECT_ROOT } from '../../server/config';
import { lockDataDir } from '../../server/data-dir-lock';
import { openDatabase } from '../../server/db/client';
import { migrate } from '../../server/db/migrate';
import { FLOORS, largeDataDir, META_FILE, pgDirOf, readMeta, type LargeSeedMeta } from './large-dir';
import { LARGE_SEED_VERSION, LARGE_TODAY, seedLarge } from './seed-large-generator';

function fail(message: string): never {
  console.error(message);
  process.exit(2);
}

const { values } = parseArgs({
  options: { scale: { type: 'string', default: '1' }, force: { type: 'boolean', default: false } },
  strict: true,
});
const scale = Number(values.scale);
if (!Number.isFinite(scale) || scale <= 0 || scale > 4)
  fail(`--scale must be a number above 0 and at most 4, not "${values.scale}"`);

const dir = largeDataDir();
const done = readMeta(dir);
if (done && done.version !== LARGE_SEED_VERSION && !values.force) {
  fail(
    `${dir} holds a large seed from an older generator (version ${done.version}, now ${LARGE_SEED_VERSION}): run again with --force to rebuild it.`,
  );
}
if (done && !values.force) {
  console.log(`${dir} already holds the large seed (scale ${done.scale}, today ${done.today.slice(0, 10)}):`);
  console.log(
    `  ${Object.entries(done.counts)
      .map(([table, n]) => `${table} ${n}`)
      .join(', ')}`,
  );
  console.log('Pass --force to build it again.');
  process.exit(0);
}
if (existsSync(dir) && readdirSync(dir).length > 0) {
  // Only ever wipe a dir that is plainly a data dir, and never the project's own one.
  const looksLikeOurs = existsSync(pgDirOf(dir)) || existsSync(path.join(dir, META_FILE));
  if (
    !values.force ||
    !looksLikeOurs ||
    dir === path.resolve(PROJECT_ROOT, '.vanbay') ||
    dir === PROJECT_ROOT
  ) {
    fail(
      `${dir} is not empty and holds no finished large seed: remove it, or pass --force if it is an old large seed.`,
    );
  }
}

const unlock = lockDataDir(dir);
try {
  rmSync(pgDirOf(dir), { recursive: true, force: true });
  rmSync(path.join(dir, META_FILE), { force: true });
  const started = performance.now();
  const database = await openDatabase({ engine: 'pglite', dataDir: pgDirOf(dir) });
  let counts: Record<string, number>;
  try {
    await migrate(database);
    console.log(`Seeding ten years (scale ${scale}) into ${dir} …`);
    ({ counts } = await seedLarge(database.db, {
      today: LARGE_TODAY,
      scale,
      log: (line) => console.log(`  ${line}  [${((performance.now() - started) / 1000).toFixed(1)} s]`),
    }));
  } finally {
    await database.close();
  }
  const seconds = Math.round((performance.now() - started) / 100) / 10;
  const meta: LargeSeedMeta = {
    version: LARGE_SEED_VERSION,
    today: LARGE_TODAY.toISOString(),
    scale,
    seconds,
    counts,
  };
  writeFileSync(path.join(dir, META_FILE), `${JSON.stringify(meta, null, 2)}\n`);
  console.log(`Done in ${seconds} s:`);
  for (const [table, n] of Object.entries(counts)) {
    const floor = FLOORS[table];
    const note =
      floor === undefined || scale < 1
        ? ''
        : n >= floor
          ? `  (≥ ${floor} asked)`
          : `  BELOW the ${floor} asked`;
    console.log(`  ${table.padEnd(18)} ${String(n).padStart(8)}${note}`);
  }
} finally {
  unlock();
}
