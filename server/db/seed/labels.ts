import { and, desc, eq, inArray } from 'drizzle-orm';
import type { SeedContext, SeedStep } from './demo';
import { batches } from '../schema/batches';
import { HttpError } from '../../lib/http-error';
import { printLabels } from '../../features/labels/labels.service';
import type { PrintLabelsInput } from '../../../shared/contracts/labels';

const LETTER = { paper: 'letter' as const, marginTopMm: 12.7, marginLeftMm: 12.7, marginRightMm: 12.7, marginBottomMm: 12.7, gutterXMm: 3, gutterYMm: 3 };

/**
 * Print runs for a few released (and sold-out) Juniper Lane batches: a Letter sheet of 2 × 2 in labels by the
 * baker, a reprint on A4 with a proof page, and a label-printer roll by the owner. Batches the label check
 * refuses are skipped (the demo's recalled and held batches stay unlabelled).
 */
export const labelsSeedStep: SeedStep = {
  name: 'labels',
  run: async (ctx: SeedContext) => {
    const rows = await ctx.db
      .select({ id: batches.id, madeOn: batches.madeOn })
      .from(batches)
      .where(and(eq(batches.businessId, ctx.businessId), inArray(batches.state, ['released', 'sold_out'])))
      .orderBy(desc(batches.madeOn), desc(batches.daySequence))
      .limit(6);
    const plans: Array<{ who: 'owner' | 'baker'; hoursAgo: number; input: Omit<PrintLabelsInput, 'batchId'> }> = [
      { who: 'baker', hoursAgo: 2, input: { templateId: 'square-2in', count: 24, sheet: LETTER, includeProofPage: false, confirmNeedsReview: false } },
      { who: 'baker', hoursAgo: 26, input: { templateId: 'rect-3x2in', count: 16, sheet: { ...LETTER, paper: 'a4' }, includeProofPage: true, confirmNeedsReview: false } },
      { who: 'owner', hoursAgo: 50, input: { templateId: 'rect-4x3in', count: 6, sheet: { ...LETTER, paper: 'roll' }, includeProofPage: false, confirmNeedsReview: true } },
    ];
    let next = 0;
    for (const row of rows) {
      if (next >= plans.length) break;
      const plan = plans[next]!;
      const now = new Date(ctx.now.getTime() - plan.hoursAgo * 3_600_000);
      try {
        await printLabels(ctx.db, ctx.actors[plan.who], { ...plan.input, batchId: row.id }, { now, publicBaseUrl: ctx.publicBaseUrl });
        next++;
      } catch (err) {
        if (!(err instanceof HttpError)) throw err;
      }
    }
  },
};
