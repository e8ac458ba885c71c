import { sql, type SQL } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';

/** The packet's scope: one business, business-local dates (both ends included) in its time zone. */
export interface PacketScope {
  businessId: string;
  from: string;
  to: string;
  timeZone: string;
}

/**
 * One CSV file (and the rows a PDF section walks): columns as SQL expressions, read in keyset pages
 * of (k1, k2) so memory stays flat however long the range is.
 */
export interface PacketTable {
  file: string;
  columns: ReadonlyArray<readonly [header: string, expr: SQL]>;
  /** FROM … WHERE …, already scoped to the business and range. */
  from: SQL;
  k1: SQL;
  k1Type: 'timestamptz' | 'date' | 'bigint';
  /** A unique uuid that breaks ties within k1. */
  k2: SQL;
}

const PAGE_ROWS = 2000;

/**
 * ISO 8601 with the offset of the session zone, which the export transaction sets to the business
 * zone (RFC 3339 §5.6); PostgreSQL's tz database does the offset, row by row, at COPY speed.
 */
export const iso = (col: SQL) => sql`to_char(${col}, 'YYYY-MM-DD"T"HH24:MI:SSTZH:TZM')`;
/** The UTC instant to the millisecond, exactly as the record chain hashes it (Date#toISOString). */
const utc = (col: SQL) => sql`to_char(${col} at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"')`;

/** Instants on the business's calendar days from..to: [from 00:00, to+1 00:00) local. */
export function instantInRange(col: SQL, s: PacketScope): SQL {
  return sql`(${col} >= (${s.from}::date::timestamp at time zone ${s.timeZone}) and ${col} < ((${s.to}::date + 1)::timestamp at time zone ${s.timeZone}))`;
}
const dateInRange = (col: SQL, s: PacketScope) => sql`(${col} between ${s.from}::date and ${s.to}::date)`;

/** Makes the export transaction's timestamps print in the business's zone. */
export async function useBusinessZone(tx: DbOrTx, timeZone: string): Promise<void> {
  await tx.execute(sql`select set_config('TimeZone', ${timeZone}, true)`);
}

/** Reads a table's rows in keyset pages; every cell is text or null. */
export async function* tableRows(tx: DbOrTx, t: PacketTable): AsyncGenerator<(string | null)[]> {
  const select = sql.join(t.columns.map(([, expr], i) => sql`(${expr})::text as ${sql.identifier(`c${i}`)}`), sql`, `);
  const cast = sql.raw(t.k1Type);
  let after: [string, string] | null = null;
  for (;;) {
    const keyset: SQL = after ? sql`and (${t.k1}, ${t.k2}) > (${after[0]}::${cast}, ${after[1]}::uuid)` : sql``;
    const res = await tx.execute(sql`select ${select}, (${t.k1})::text as k1, (${t.k2})::text as k2 ${t.from} ${keyset} order by ${t.k1}, ${t.k2} limit ${PAGE_ROWS}`);
    const rows = res.rows as Record<string, string | null>[];
    for (const r of rows) yield t.columns.map((_, i) => r[`c${i}`] ?? null);
    if (rows.length < PAGE_ROWS) return;
    const last = rows[rows.length - 1]!;
    after = [last.k1!, last.k2!];
  }
}

/** Every CSV in the packet, in the order they are written. */
export function packetTables(s: PacketScope): PacketTable[] {
  const biz = s.businessId;
  const holdingInRange = sql`exists (select 1 from holding_periods xp where xp.id = x.period_id and xp.business_id = ${biz} and ${instantInRange(sql`xp.started_at`, s)})`;
  return [
    {
      file: 'batches.csv',
      columns: [
        ['lot_code', sql`b.lot_code`], ['product', sql`rv.name`], ['recipe_version', sql`rv.version`], ['made_on', sql`b.made_on`],
        ['state', sql`b.state`], ['record_version', sql`b.current_version`], ['quantity_pieces', sql`bv.quantity_pieces`],
        ['quantity_packages', sql`bv.quantity_packages`], ['shelf_life_days', sql`bv.shelf_life_days`], ['best_by', sql`bv.best_by`],
        ['made_by', sql`u.display_name`], ['notes', sql`bv.notes`], ['recorded_at', iso(sql`b.created_at`)], ['batch_id', sql`b.id`], ['recipe_version_id', sql`b.recipe_version_id`],
      ],
      from: sql`from batches b join recipe_versions rv on rv.id = b.recipe_version_id
        join batch_versions bv on bv.batch_id = b.id and bv.version = b.current_version
        left join users u on u.id = bv.made_by_user_id
        where b.business_id = ${biz} and ${dateInRange(sql`b.made_on`, s)}`,
      k1: sql`b.made_on`, k1Type: 'date', k2: sql`b.id`,
    },
    {
      file: 'batch-inputs.csv',
      columns: [
        ['lot_code', sql`b.lot_code`], ['batch_version', sql`bv.version`], ['ingredient', sql`(select iv.label_name from ingredient_versions iv where iv.ingredient_id = x.ingredient_id order by iv.version desc limit 1)`],
        ['supplier_lot', sql`sl.lot_code`], ['sub_recipe', sql`(select r2.name from recipe_versions r2 where r2.recipe_id = x.sub_recipe_id order by r2.version desc limit 1)`],
        ['source_batch_lot', sql`sb.lot_code`], ['recorded_at', iso(sql`x.created_at`)], ['batch_id', sql`b.id`], ['input_id', sql`x.id`],
      ],
      from: sql`from batch_inputs x join batches b on b.id = x.batch_id join batch_versions bv on bv.id = x.batch_version_id
        left join supplier_lots sl on sl.id = x.supplier_lot_id left join batches sb on sb.id = x.source_batch_id
        where x.business_id = ${biz} and ${dateInRange(sql`b.made_on`, s)}`,
      k1: sql`x.created_at`, k1Type: 'timestamptz', k2: sql`x.id`,
    },
    {
      file: 'batch-state-changes.csv',
      columns: [
        ['lot_code', sql`b.lot_code`], ['from_state', sql`x.from_state`], ['to_state', sql`x.to_state`], ['reason', sql`x.reason`],
        ['changed_by', sql`x.changed_by_name`], ['changed_at', iso(sql`x.changed_at`)], ['details', sql`x.details`], ['batch_id', sql`b.id`], ['change_id', sql`x.id`],
      ],
      from: sql`from batch_state_changes x join batches b on b.id = x.batch_id
        where x.business_id = ${biz} and (${instantInRange(sql`x.changed_at`, s)} or ${dateInRange(sql`b.made_on`, s)})`,
      k1: sql`x.changed_at`, k1Type: 'timestamptz', k2: sql`x.id`,
    },
    {
      file: 'holding-periods.csv',
      columns: [
        ['lot_code', sql`b.lot_code`], ['kind', sql`x.kind`], ['label', sql`x.label`], ['policy', sql`x.policy`], ['limit_minutes', sql`x.limit_minutes`],
        ['policy_source', sql`x.policy_source`], ['rule_profile', sql`x.rule_profile_id`], ['started_at', iso(sql`x.started_at`)], ['started_by', sql`x.started_by_name`],
        ['started_by_role', sql`x.started_by_role`], ['stopped_at', iso(sql`st.stopped_at`)], ['stopped_by', sql`st.stopped_by_name`], ['stop_note', sql`st.note`],
        ['elapsed_minutes', sql`floor(extract(epoch from (st.stopped_at - x.started_at)) / 60)::int`], ['period_id', sql`x.id`], ['batch_id', sql`b.id`],
      ],
      from: sql`from holding_periods x join batches b on b.id = x.batch_id left join holding_stops st on st.period_id = x.id
        where x.business_id = ${biz} and ${instantInRange(sql`x.started_at`, s)}`,
      k1: sql`x.started_at`, k1Type: 'timestamptz', k2: sql`x.id`,
    },
    {
      file: 'holding-readings.csv',
      columns: [
        ['period_id', sql`x.period_id`], ['value', sql`x.value`], ['unit', sql`x.unit`], ['taken_at', iso(sql`x.taken_at`)],
        ['taken_by', sql`x.taken_by_name`], ['taken_by_role', sql`x.taken_by_role`], ['reading_id', sql`x.id`],
      ],
      from: sql`from holding_readings x where x.business_id = ${biz} and ${holdingInRange}`,
      k1: sql`x.taken_at`, k1Type: 'timestamptz', k2: sql`x.id`,
    },
    {
      file: 'holding-actions.csv',
      columns: [
        ['period_id', sql`x.period_id`], ['action', sql`x.action`], ['reason', sql`x.reason`], ['recorded_at', iso(sql`x.recorded_at`)],
        ['recorded_by', sql`x.recorded_by_name`], ['recorded_by_role', sql`x.recorded_by_role`], ['action_id', sql`x.id`],
      ],
      from: sql`from holding_actions x where x.business_id = ${biz} and ${holdingInRange}`,
      k1: sql`x.recorded_at`, k1Type: 'timestamptz', k2: sql`x.id`,
    },
    {
      file: 'cleaning-runs.csv',
      columns: [
        ['run_date', sql`x.run_date`], ['checklist', sql`x.template_name`], ['frequency', sql`x.frequency`], ['lot_code', sql`b.lot_code`],
        ['started_at', iso(sql`x.started_at`)], ['started_by', sql`x.started_by_name`], ['started_by_role', sql`x.started_by_role`],
        ['current_version', sql`(select max(v.version) from cleaning_run_versions v where v.run_id = x.id)`], ['run_id', sql`x.id`],
      ],
      from: sql`from cleaning_runs x left join batches b on b.id = x.batch_id where x.business_id = ${biz} and ${dateInRange(sql`x.run_date`, s)}`,
      k1: sql`x.run_date`, k1Type: 'date', k2: sql`x.id`,
    },
    {
      file: 'cleaning-steps.csv',
      columns: [
        ['run_id', sql`x.run_id`], ['run_version', sql`v.version`], ['step', sql`(select st->>'label' from jsonb_array_elements(r.steps) st where st->>'key' = x.step_key limit 1)`],
        ['entry_kind', sql`x.entry_kind`], ['explains_entry_id', sql`x.explains_entry_id`], ['done_at', iso(sql`x.done_at`)], ['done_by', sql`x.done_by_name`], ['done_by_role', sql`x.done_by_role`],
        ['sanitiser', sql`x.sanitiser`], ['sanitiser_product', sql`sp.name`], ['concentration_ppm', sql`x.concentration_ppm`],
        ['water_temperature', sql`x.temperature_value`], ['temperature_unit', sql`x.temperature_unit`], ['ph', sql`x.ph`], ['contact_seconds', sql`x.contact_seconds`],
        ['hardness_ppm', sql`x.hardness_ppm`], ['check_passed', sql`x.check_passed`], ['check_problems', sql`x.check_problems`], ['failure_reason', sql`x.failure_reason`],
        ['note', sql`x.note`], ['carried_from_entry_id', sql`x.carried_from_entry_id`], ['entry_id', sql`x.id`],
      ],
      from: sql`from cleaning_step_entries x join cleaning_run_versions v on v.id = x.run_version_id join cleaning_runs r on r.id = x.run_id
        left join sanitiser_products sp on sp.id = x.sanitiser_product_id
        where x.business_id = ${biz} and ${dateInRange(sql`r.run_date`, s)}`,
      k1: sql`x.done_at`, k1Type: 'timestamptz', k2: sql`x.id`,
    },
    // Sales and recalls name buyers only by an opaque customer id: contact details live in
    // customer_contacts, which the packet never reads.
    {
      file: 'sales.csv',
      columns: [
        ['sold_on', sql`x.sold_on`], ['lot_code', sql`b.lot_code`], ['kind', sql`x.kind`], ['voids_sale_id', sql`x.voids_sale_id`], ['quantity', sql`x.quantity`],
        ['unit', sql`x.unit`], ['amount_cents', sql`x.amount_cents`], ['channel', sql`x.channel`], ['customer_ref', sql`x.customer_id`], ['reason', sql`x.reason`],
        ['recorded_by', sql`x.recorded_by_name`], ['recorded_at', iso(sql`x.recorded_at`)], ['sale_id', sql`x.id`],
      ],
      from: sql`from sales x join batches b on b.id = x.batch_id where x.business_id = ${biz} and ${dateInRange(sql`x.sold_on`, s)}`,
      k1: sql`x.recorded_at`, k1Type: 'timestamptz', k2: sql`x.id`,
    },
    {
      file: 'recalls.csv',
      columns: [
        ['opened_at', iso(sql`x.opened_at`)], ['opened_by', sql`x.opened_by_name`], ['reason', sql`x.reason`], ['public_notice', sql`x.public_notice`],
        ['scope', sql`x.scope_kind`], ['supplier_lot', sql`sl.lot_code`], ['status', sql`x.status`], ['closed_at', iso(sql`x.closed_at`)],
        ['closed_by', sql`x.closed_by_name`], ['close_note', sql`x.close_note`], ['recall_id', sql`x.id`],
      ],
      from: sql`from recalls x left join supplier_lots sl on sl.id = x.supplier_lot_id
        where x.business_id = ${biz} and (${instantInRange(sql`x.opened_at`, s)} or ${instantInRange(sql`x.closed_at`, s)})`,
      k1: sql`x.opened_at`, k1Type: 'timestamptz', k2: sql`x.id`,
    },
    {
      file: 'recall-batches.csv',
      columns: [['recall_id', sql`x.recall_id`], ['lot_code', sql`b.lot_code`], ['from_state', sql`x.from_state`], ['to_state', sql`x.to_state`], ['batch_id', sql`b.id`]],
      from: sql`from recall_batches x join batches b on b.id = x.batch_id join recalls r on r.id = x.recall_id
        where x.business_id = ${biz} and (${instantInRange(sql`r.opened_at`, s)} or ${instantInRange(sql`r.closed_at`, s)})`,
      k1: sql`x.created_at`, k1Type: 'timestamptz', k2: sql`x.id`,
    },
    {
      file: 'recall-notifications.csv',
      columns: [['recall_id', sql`x.recall_id`], ['customer_ref', sql`x.customer_id`], ['method', sql`x.method`], ['note', sql`x.note`], ['by', sql`x.by_name`], ['at', iso(sql`x.at`)]],
      from: sql`from recall_notifications x join recalls r on r.id = x.recall_id
        where x.business_id = ${biz} and (${instantInRange(sql`r.opened_at`, s)} or ${instantInRange(sql`r.closed_at`, s)})`,
      k1: sql`x.at`, k1Type: 'timestamptz', k2: sql`x.id`,
    },
    correctionsTable(s),
    {
      file: 'record-events.csv',
      columns: [
        ['seq', sql`x.seq`], ['occurred_at', iso(sql`x.occurred_at`)], ['recorded_at', iso(sql`x.recorded_at`)], ['actor_name', sql`x.actor_name`],
        ['actor_role', sql`x.actor_role`], ['actor_user_id', sql`x.actor_user_id`], ['entity_type', sql`x.entity_type`], ['entity_id', sql`x.entity_id`],
        ['action', sql`x.action`], ['reason', sql`x.reason`], ['payload', sql`x.payload`], ['idempotency_key', sql`x.idempotency_key`],
        ['occurred_at_utc', utc(sql`x.occurred_at`)], ['recorded_at_utc', utc(sql`x.recorded_at`)], ['prev_hash', sql`x.prev_hash`], ['hash', sql`x.hash`], ['event_id', sql`x.id`],
      ],
      from: sql`from record_events x where x.business_id = ${biz} and ${instantInRange(sql`x.occurred_at`, s)}`,
      k1: sql`x.seq`, k1Type: 'bigint', k2: sql`x.id`,
    },
  ];
}

/** Corrections: every later version of a batch or cleaning run, and every voided sale, with its reason. */
export function correctionsTable(s: PacketScope): PacketTable {
  const biz = s.businessId;
  return {
    file: 'corrections.csv',
    columns: [
      ['recorded_at', iso(sql`c.at`)], ['record', sql`c.record`], ['reference', sql`c.ref`], ['version', sql`c.version`], ['reason', sql`c.reason`], ['by', sql`c.by_name`], ['row_id', sql`c.id`],
    ],
    from: sql`from (
        select bv.id, bv.created_at as at, 'batch' as record, b.lot_code as ref, bv.version, bv.reason, coalesce(u.display_name, '') as by_name
          from batch_versions bv join batches b on b.id = bv.batch_id left join users u on u.id = bv.created_by_user_id
          where bv.business_id = ${biz} and bv.version > 1 and ${instantInRange(sql`bv.created_at`, s)}
        union all
        select cv.id, cv.created_at, 'cleaning_run', cr.template_name || ' ' || cr.run_date::text, cv.version, cv.reason, cv.created_by_name
          from cleaning_run_versions cv join cleaning_runs cr on cr.id = cv.run_id
          where cv.business_id = ${biz} and cv.version > 1 and ${instantInRange(sql`cv.created_at`, s)}
        union all
        select sv.id, sv.recorded_at, 'sale_void', b.lot_code, null::int, sv.reason, sv.recorded_by_name
          from sales sv join batches b on b.id = sv.batch_id
          where sv.business_id = ${biz} and sv.kind = 'void' and ${instantInRange(sql`sv.recorded_at`, s)}
      ) c where true`,
    k1: sql`c.at`, k1Type: 'timestamptz', k2: sql`c.id`,
  };
}
