import { and, desc, eq, inArray } from 'drizzle-orm';
import type { SeedContext, SeedStep } from './demo';
import type { Actor } from '../../lib/actor';
import { batches } from '../schema/batches';
import { recipes, recipeVersions } from '../schema/recipes';
import { createBatch } from '../../features/batches/batches.service';
import { appendRecordEvent } from '../../features/records/record-events.service';
import {
  addHoldingReading, recordHoldingAction, saveWrittenProcedure, startHoldingPeriod, stopHoldingPeriod,
} from '../../features/holding/holding.service';

const MIN = 60_000;
const HOUR = 60 * MIN;

/** Sellable recipe versions to hang the demo's holding periods on; makes one if the demo has none yet. */
async function demoRecipeVersionIds(ctx: SeedContext): Promise<string[]> {
  const rows = await ctx.db
    .select({ id: recipeVersions.id })
    .from(recipeVersions)
    .where(and(eq(recipeVersions.businessId, ctx.businessId), eq(recipeVersions.isSellable, true), eq(recipeVersions.isArchived, false)))
    .orderBy(desc(recipeVersions.version))
    .limit(4);
  if (rows.length > 0) return rows.map((r) => r.id);
  const [recipe] = await ctx.db.insert(recipes).values({ businessId: ctx.businessId }).returning();
  const [version] = await ctx.db.insert(recipeVersions).values({
    businessId: ctx.businessId, recipeId: recipe!.id, version: 1, name: 'Lemon curd cake pops', components: [], createdByUserId: ctx.actors.owner.userId,
  }).returning();
  await ctx.db.transaction((tx) => appendRecordEvent(tx, ctx.actors.owner, { entityType: 'recipe', entityId: recipe!.id, action: 'create', payload: { name: version!.name, version: 1 } }, ctx.now));
  return [version!.id];
}

async function demoBatches(ctx: SeedContext, count: number): Promise<string[]> {
  const existing = await ctx.db
    .select({ id: batches.id })
    .from(batches)
    .where(and(eq(batches.businessId, ctx.businessId), inArray(batches.state, ['in_progress', 'released'])))
    .orderBy(desc(batches.madeOn), desc(batches.createdAt))
    .limit(count);
  const ids = existing.map((b) => b.id);
  const versionIds = await demoRecipeVersionIds(ctx);
  for (let i = 0; ids.length < count; i += 1) {
    const made = await createBatch(ctx.db, ctx.actors.baker, { recipeVersionId: versionIds[i % versionIds.length]! }, ctx.now);
    ids.push(made.id);
  }
  return ids;
}

const at = (ctx: SeedContext, msAgo: number) => new Date(ctx.now.getTime() - msAgo);

/**
 * Holding demo for Juniper Lane Cake Pops: the written TPHC procedure; two timers running (a 4-hour
 * TPHC display due soon, a custom coating-setting limit); a cooling timer over its first stage with no
 * action yet (first on the Kitchen board); closed periods with a discard after TPHC ran over, a reheat
 * after a failed first cooling stage, and a cooling that passed both stages.
 */
export const holdingSeedStep: SeedStep = {
  name: 'holding times',
  async run(ctx) {
    const { owner, baker, helper } = ctx.actors;
    const [displayBatch, settingBatch, coolingBatch, discardBatch, reheatBatch] = await demoBatches(ctx, 5);
    const start = (actor: Actor, input: Parameters<typeof startHoldingPeriod>[2], msAgo: number) => startHoldingPeriod(ctx.db, actor, input, undefined, at(ctx, msAgo));
    const reading = (actor: Actor, id: string, value: string, unit: 'F' | 'C', msAgo: number) => addHoldingReading(ctx.db, actor, id, { value, unit }, undefined, at(ctx, msAgo));

    await saveWrittenProcedure(ctx.db, owner, {
      title: 'Time as a public health control for cake pops and filled treats',
      body: [
        'Applies to cake pops with cream-cheese or curd fillings taken out of the fridge for display or a market stall.',
        '1. Take the temperature of the warmest pop when it leaves the fridge; it must be 41 °F (5 °C) or colder.',
        '2. Start a 4-hour timer on the Kitchen board at that moment; the tray label shows the discard time.',
        '3. Sell within 4 hours. Anything left at the deadline goes in the bin and the discard is recorded on the board.',
        '4. Never put these pops back in the fridge to reuse the time.',
      ].join('\n'),
    }, at(ctx, 14 * 24 * HOUR));

    // Closed: TPHC ran 15 minutes past 4 hours at the Saturday market → discarded.
    const late = await start(helper, { batchId: discardBatch!, kind: 'display', policy: 'tphc_4h', firstReading: { value: '38', unit: 'F' } }, 2 * 24 * HOUR + 6 * HOUR);
    await reading(helper, late.id, '63', 'F', 2 * 24 * HOUR + 4 * HOUR);
    await stopHoldingPeriod(ctx.db, helper, late.id, { note: 'Packed up late after the market' }, undefined, at(ctx, 2 * 24 * HOUR + 1 * HOUR + 45 * MIN));
    await recordHoldingAction(ctx.db, owner, late.id, { action: 'discarded', reason: 'Eleven pops left after the 4-hour mark went in the bin.' }, undefined, at(ctx, 2 * 24 * HOUR + 1 * HOUR + 30 * MIN));

    // Closed: lemon curd filling missed 70 °F within 2 hours → reheated and cooled again.
    const slow = await start(baker, { batchId: reheatBatch!, kind: 'cooling', policy: 'cooling', firstReading: { value: '150', unit: 'F' } }, 3 * 24 * HOUR + 5 * HOUR);
    await reading(baker, slow.id, '104', 'F', 3 * 24 * HOUR + 4 * HOUR);
    await reading(baker, slow.id, '76', 'F', 3 * 24 * HOUR + 2 * HOUR + 50 * MIN);
    await recordHoldingAction(ctx.db, baker, slow.id, { action: 'reheated', reason: 'Reheated the curd to 165 °F and spread it in a thinner tray.' }, undefined, at(ctx, 3 * 24 * HOUR + 2 * HOUR + 45 * MIN));
    // …and the second cooling passed both stages.
    const redo = await start(baker, { batchId: reheatBatch!, kind: 'cooling', policy: 'cooling', firstReading: { value: '165', unit: 'F' } }, 3 * 24 * HOUR + 2 * HOUR + 40 * MIN);
    await reading(baker, redo.id, '68', 'F', 3 * 24 * HOUR + 1 * HOUR + 20 * MIN);
    await reading(baker, redo.id, '39', 'F', 3 * 24 * HOUR - 1 * HOUR);
    await stopHoldingPeriod(ctx.db, baker, redo.id, { note: 'Into the fridge' }, undefined, at(ctx, 3 * 24 * HOUR - 1 * HOUR - 5 * MIN));

    // Over the first cooling stage now, nothing recorded yet: the Kitchen board shows it first.
    const over = await start(baker, { batchId: coolingBatch!, kind: 'cooling', policy: 'cooling', firstReading: { value: '148', unit: 'F' } }, 2 * HOUR + 20 * MIN);
    await reading(baker, over.id, '97', 'F', 1 * HOUR + 20 * MIN);
    await reading(helper, over.id, '78', 'F', 10 * MIN);

    // Running: TPHC 4 h started 3 h 40 min ago → due soon.
    const display = await start(helper, { batchId: displayBatch!, kind: 'display', policy: 'tphc_4h', firstReading: { value: '39', unit: 'F' } }, 3 * HOUR + 40 * MIN);
    await reading(helper, display.id, '61', 'F', 1 * HOUR);

    // Running: the bakery's own 90-minute limit for the chocolate coating to set.
    await start(baker, { batchId: settingBatch!, kind: 'setting', policy: 'custom', customLimitMinutes: 90 }, 25 * MIN);
  },
};
