import { and, desc, eq, inArray } from 'drizzle-orm';
import type { Db } from '../../db/client';
import type { Actor } from '../../lib/actor';
import { batches } from '../../db/schema/batches';
import { recipeVersions } from '../../db/schema/recipes';
import type { KitchenBoard, KitchenBoardSection, KitchenBoardSectionKind } from '../../../shared/contracts/kitchen-board';
import { businessTimeZone, loadHoldingPeriods } from './holding.queries';

/**
 * One section of the kitchen board. Features register a provider (cleanings due, documents
 * expiring, the sales-cap warning); `load` answers null to leave its section off the board.
 */
export interface KitchenBoardSectionProvider {
  kind: KitchenBoardSectionKind;
  /** Lower comes first on the board. */
  order: number;
  load: (db: Db, actor: Actor, now: Date) => Promise<KitchenBoardSection | null>;
}

const providers: KitchenBoardSectionProvider[] = [];

/** Adds (or replaces, by kind) a section of the kitchen board; call it when your router is created. */
export function registerKitchenBoardSection(provider: KitchenBoardSectionProvider): void {
  const i = providers.findIndex((p) => p.kind === provider.kind);
  if (i >= 0) providers.splice(i, 1, provider);
  else providers.push(provider);
  providers.sort((a, b) => a.order - b.order);
}

/** Running timers plus stopped ones still waiting for their corrective action, over-limit first. */
export const holdingTimersSection: KitchenBoardSectionProvider = {
  kind: 'holding_timers',
  order: 10,
  async load(db, actor, now) {
    const periods = (await loadHoldingPeriods(db, actor.businessId, { runningOnly: true, includeUnresolved: true }, now)).filter((p) => !p.stopped || p.needsAction);
    const batchOptions = await db
      .select({ id: batches.id, lotCode: batches.lotCode, productName: recipeVersions.name, state: batches.state })
      .from(batches)
      .innerJoin(recipeVersions, eq(recipeVersions.id, batches.recipeVersionId))
      .where(and(eq(batches.businessId, actor.businessId), inArray(batches.state, ['in_progress', 'released', 'held'])))
      .orderBy(desc(batches.madeOn), desc(batches.createdAt))
      .limit(100);
    return { kind: 'holding_timers', periods, batchOptions };
  },
};

/** Batches still being made, newest first. */
export const batchesInProgressSection: KitchenBoardSectionProvider = {
  kind: 'batches_in_progress',
  order: 20,
  async load(db, actor) {
    const rows = await db
      .select({ id: batches.id, lotCode: batches.lotCode, productName: recipeVersions.name, madeOn: batches.madeOn })
      .from(batches)
      .innerJoin(recipeVersions, eq(recipeVersions.id, batches.recipeVersionId))
      .where(and(eq(batches.businessId, actor.businessId), eq(batches.state, 'in_progress')))
      .orderBy(desc(batches.madeOn), desc(batches.createdAt))
      .limit(50);
    return { kind: 'batches_in_progress', batches: rows };
  },
};

registerKitchenBoardSection(holdingTimersSection);
registerKitchenBoardSection(batchesInProgressSection);

/** The whole board in one call, each section computed at `now`. */
export async function getKitchenBoard(db: Db, actor: Actor, now: Date): Promise<KitchenBoard> {
  const business = await businessTimeZone(db, actor.businessId);
  const sections: KitchenBoardSection[] = [];
  for (const provider of providers) {
    const section = await provider.load(db, actor, now);
    if (section) sections.push(section);
  }
  return { serverNow: now.toISOString(), timeZone: business.timeZone, businessName: business.name, sections };
}
