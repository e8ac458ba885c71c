import { and, asc, eq, lt } from 'drizzle-orm';
import type { SeedStep } from './demo';
import type { Actor } from '../../lib/actor';
import { batches } from '../schema/batches';
import { businesses } from '../schema/business';
import { DEMO_ACCOUNTS } from './demo-accounts';
import { createCleaningTemplate, createEquipment, createSanitiserProduct } from '../../features/cleaning/cleaning-setup.service';
import { addCleaningStep, correctCleaningRun, signCleaningRun, startCleaningRun } from '../../features/cleaning/cleaning.service';
import { addCalendarDays } from '../../../shared/domain/calendar-date';
import { businessLocalDate, localDateTimeToInstants } from '../../../shared/domain/zoned-time';
import type { SanitisingInput } from '../../../shared/contracts/cleaning';

const MIN = 60_000;

/**
 * Cleaning demo for Juniper Lane Cake Pops: five pieces of equipment, an invented quat product, a daily
 * open/close checklist and an after-each-batch checklist; two weeks of signed daily runs and a signed
 * run after each demo batch (by Ivy the helper and Tobias the baker); one failed chlorine check that was
 * redone; one run corrected with a reason and signed again; and today's run still in progress.
 */
export const cleaningSeedStep: SeedStep = {
  name: 'cleaning',
  async run(ctx) {
    const { db, businessId, actors } = ctx;
    const [business] = await db.select({ timeZone: businesses.timeZone }).from(businesses).where(eq(businesses.id, businessId));
    const zone = business!.timeZone;
    const today = businessLocalDate(ctx.now, zone);
    const at = (date: string, hhmm: string) => localDateTimeToInstants(`${date}T${hhmm}`, zone)[0]!;
    const setupTime = at(addCalendarDays(today, -40), '09:00');
    const { owner, baker, helper } = actors;

    const eq1 = async (name: string, kind: 'utensil' | 'surface' | 'container', location: string) =>
      (await createEquipment(db, owner, { name, kind, isFoodContact: true, location }, setupTime)).id;
    const bowl = await eq1('Stand mixer bowl', 'utensil', 'Main counter');
    const counters = await eq1('Counters', 'surface', 'Kitchen');
    const moulds = await eq1('Cake-pop moulds', 'utensil', 'Baking shelf');
    const pots = await eq1('Dipping pots', 'container', 'Dipping station');
    const pans = await eq1('Sheet pans', 'utensil', 'Oven rack');
    // An invented product; its label range is what quat steps are checked against.
    const quat = await createSanitiserProduct(db, owner, {
      name: 'Millbrook QuatTabs', sanitiser: 'quaternary_ammonium', labelMinPpm: 200, labelMaxPpm: 400, labelMinTempC: 24, labelContactSeconds: 60, labelMaxHardnessPpm: 500,
    }, setupTime);
    const daily = await createCleaningTemplate(db, baker, {
      name: 'Daily open and close', frequency: 'daily',
      steps: [{ kind: 'wash' }, { kind: 'rinse' }, { kind: 'sanitise' }, { kind: 'air_dry' }, { kind: 'custom', label: 'Wipe handles and fridge door' }],
      equipmentIds: [counters, bowl, pans],
    }, setupTime);
    const perBatch = await createCleaningTemplate(db, baker, {
      name: 'After each batch', frequency: 'per_batch',
      steps: [{ kind: 'wash', label: 'Scrape and wash in hot soapy water' }, { kind: 'rinse' }, { kind: 'sanitise' }, { kind: 'air_dry' }],
      equipmentIds: [moulds, pots, bowl],
    }, setupTime);

    // Quat at 300 ppm, 78 °F, 60 s passes the label (FDA Food Code 2022 4-501.114(C)); chlorine at
    // 100 ppm, 70 °F, pH 7.5, 10 s passes 4-501.114(A) and 4-703.11(C).
    const QUAT: SanitisingInput = { sanitiser: 'quaternary_ammonium', productId: quat.id, concentrationPpm: 300, waterTemperature: { value: 78, unit: 'F' }, hardnessPpm: 180, contactSeconds: 60 };
    const CHLORINE: SanitisingInput = { sanitiser: 'chlorine', concentrationPpm: 100, waterTemperature: { value: 70, unit: 'F' }, ph: 7.5, contactSeconds: 10 };
    const passwordOf = (a: Actor) => DEMO_ACCOUNTS.find((d) => d.role === a.role)!.password;

    /** One run from `start`, a step every few minutes, then signed by the same person. */
    async function run(by: Actor, templateId: string, start: Date, opts: { batchId?: string; sanitising: SanitisingInput; failFirst?: SanitisingInput; sign?: boolean; steps?: number }) {
      let t = start.getTime();
      const next = () => new Date((t += 6 * MIN));
      const started = await startCleaningRun(db, by, { templateId, batchId: opts.batchId }, {}, new Date(t));
      const keys = started.steps.map((s) => s.key).slice(0, opts.steps);
      for (const key of keys) {
        const kind = started.steps.find((s) => s.key === key)!.kind;
        if (kind === 'sanitise' && opts.failFirst) {
          await addCleaningStep(db, by, started.id, { stepKey: key, sanitising: opts.failFirst }, {}, next());
          await addCleaningStep(db, by, started.id, { stepKey: key, sanitising: opts.sanitising, note: 'Mixed a fresh solution and tested it again' }, {}, next());
        } else {
          await addCleaningStep(db, by, started.id, kind === 'sanitise' ? { stepKey: key, sanitising: opts.sanitising } : { stepKey: key }, {}, next());
        }
      }
      if (opts.sign !== false) await signCleaningRun(db, by, started.id, { password: passwordOf(by) }, {}, next());
      return started.id;
    }

    // Two weeks of daily close-downs, mostly by Ivy.
    for (let d = 14; d >= 1; d -= 1) {
      const date = addCalendarDays(today, -d);
      const by = d % 3 === 0 ? baker : helper;
      // Five days ago the chlorine (used while the quat tabs ran out) tested 50 ppm at 80 °F and pH 9:
      // too cool for that pH (4-501.114(A) needs 100 °F), so it was mixed again and passed.
      const failFirst: SanitisingInput | undefined = d === 5 ? { sanitiser: 'chlorine', concentrationPpm: 50, waterTemperature: { value: 80, unit: 'F' }, ph: 9, contactSeconds: 10 } : undefined;
      const id = await run(by, daily.id, at(date, '17:30'), { sanitising: d === 5 ? CHLORINE : QUAT, failFirst });
      if (d === 3) {
        await correctCleaningRun(db, baker, id, {
          reason: 'Ivy wrote 78 °F for the quat solution; the thermometer log says 80 °F. Re-entered from the log.',
          steps: [{ stepKey: 's3', sanitising: { ...QUAT, waterTemperature: { value: 80, unit: 'F' } }, note: 'Values from the thermometer log' }],
        }, {}, at(date, '19:15'));
        await signCleaningRun(db, baker, id, { password: passwordOf(baker) }, {}, at(date, '19:20'));
      }
    }

    // After each demo batch made before today, a per-batch clean the afternoon it was made.
    const made = await db.select({ id: batches.id, madeOn: batches.madeOn }).from(batches)
      .where(and(eq(batches.businessId, businessId), lt(batches.madeOn, today))).orderBy(asc(batches.madeOn));
    for (const [i, b] of made.entries()) {
      await run(i % 2 ? baker : helper, perBatch.id, at(b.madeOn, '15:00'), { batchId: b.id, sanitising: CHLORINE });
    }

    // Today: Ivy has washed and rinsed; sanitising, air-drying and the signature are still to come.
    const startedToday = new Date(Math.max(ctx.now.getTime() - 40 * MIN, at(today, '00:05').getTime()));
    await run(helper, daily.id, startedToday, { sanitising: QUAT, sign: false, steps: 2 });
  },
};
