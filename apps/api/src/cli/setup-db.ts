/**
 * `tsx apps/api/src/cli/setup-db.ts [--seed]`: applies migrations to DATABASE_URL and, with
 * --seed, adds the demo team. Used by scripts/start.sh and scripts/test.sh.
 */
import { loadConfig } from '../config';
import { migrate } from '../db/migrate';
import { createSequelize } from '../db/sequelize';
import { initModels } from '../db/models';
import { seedDemo } from '../seed/demo';
import { startBoss } from '../queue/run-queue';

async function main(): Promise<void> {
  const config = loadConfig();
  const applied = await migrate(config.DATABASE_URL, (m) => console.log(`[setup-db] ${m}`));
  if (applied.length === 0) console.log('[setup-db] schema up to date');
  // pg-boss creates its own schema on first start; do it here so the first API/worker start is quick.
  const boss = await startBoss(config.DATABASE_URL, { supervise: false });
  await boss.stop({ graceful: false, wait: true });
  if (process.argv.includes('--seed')) {
    const sequelize = createSequelize(config.DATABASE_URL, 2);
    initModels(sequelize);
    const { created } = await seedDemo(sequelize);
    console.log(created ? '[setup-db] demo team seeded' : '[setup-db] demo team already present');
    await sequelize.close();
  }
}

main().catch((err: unknown) => {
  console.error('[setup-db] failed:', err instanceof Error ? err.message : err);
  process.exit(1);
});
