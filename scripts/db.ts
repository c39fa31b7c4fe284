// npm run db:migrate | db:seed | (tsx scripts/db.ts rollback) against DATABASE_URL.
import { createDb, migrationConfig, seedConfig } from '../server/db/knex.js';

const command = process.argv[2];
const url = process.env.DATABASE_URL;
if (!url) {
  console.error('DATABASE_URL is not set. Use `npm start` (which brings up PostgreSQL) or set it.');
  process.exit(1);
}
const db = createDb(url);
try {
  if (command === 'migrate') {
    const [batch, files] = await db.migrate.latest(migrationConfig);
    console.log(files.length ? `Migrated (batch ${batch}): ${files.length} file(s).` : 'Database already up to date.');
  } else if (command === 'rollback') {
    await db.migrate.rollback(migrationConfig, true);
    console.log('Rolled back every migration.');
  } else if (command === 'seed') {
    const [files] = await db.seed.run(seedConfig);
    console.log(`Seeded ${files.length} file(s).`);
  } else {
    console.error('usage: tsx scripts/db.ts migrate|seed|rollback');
    process.exitCode = 2;
  }
} finally {
  await db.destroy();
}
