import { readEnv } from '../env';
import { createDb, createPool } from '../db/client';
import { seedDemo } from '../db/seed/demo';
import { DEMO_STEPS } from '../db/seed/steps';
import path from 'node:path';

const env = readEnv();
if (!env.DEMO_MODE) {
  console.error('Refusing to load demo data: DEMO_MODE is not true. Demo accounts never exist outside demo mode.');
  process.exit(1);
}
const pool = createPool(env.DATABASE_URL);
try {
  const loaded = await seedDemo(createDb(pool), DEMO_STEPS, {
    publicBaseUrl: env.PUBLIC_BASE_URL,
    uploadDir: env.UPLOAD_DIR ?? path.join(env.DATA_DIR, 'uploads'),
    log: (m) => console.log(m),
  });
  if (loaded) console.log('Demo data loaded.');
} catch (err) {
  console.error(`Loading demo data failed: ${(err as Error).stack}`);
  process.exitCode = 1;
} finally {
  await pool.end();
}
