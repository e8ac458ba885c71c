import { Router } from 'express';
import { sql } from 'drizzle-orm';
import type { AppDeps } from '../../app';
import { allow } from '../../middleware/access';

export function healthRouter({ db }: AppDeps) {
  return Router().get('/', allow('public'), async (_req, res) => {
    const started = Date.now();
    let database: 'up' | 'down' = 'up';
    try {
      await db.execute(sql`select 1`);
    } catch {
      database = 'down';
    }
    res.status(database === 'up' ? 200 : 503);
    if (database === 'down') res.set('Retry-After', '5');
    res.json({ app: 'up', database, checkedInMs: Date.now() - started, time: new Date().toISOString() });
  });
}
