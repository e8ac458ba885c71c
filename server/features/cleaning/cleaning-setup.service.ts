import { and, asc, eq, inArray, isNull } from 'drizzle-orm';
import type { Db, DbOrTx } from '../../db/client';
import type { Actor } from '../../lib/actor';
import { badRequest, notFound } from '../../lib/http-error';
import { appendRecordEvent } from '../records/record-events.service';
import {
  cleaningTemplates, equipment, sanitiserProducts, type CleaningTemplateRow, type EquipmentRow, type SanitiserProductRow, type StoredCleaningStep,
} from '../../db/schema/cleaning';
import {
  CleaningTemplateInputSchema, CleaningTemplateUpdateSchema, EquipmentInputSchema, EquipmentUpdateSchema, SanitiserProductInputSchema,
  SanitiserProductUpdateSchema, type CleaningTemplate, type CleaningTemplateInput, type CleaningTemplateUpdate, type Equipment,
  type EquipmentInput, type EquipmentUpdate, type SanitiserProduct, type SanitiserProductInput, type SanitiserProductUpdate,
} from '../../../shared/contracts/cleaning';

// Equipment, sanitiser products and templates are settings: edited in place, each change a record event.

const STEP_NAMES: Record<StoredCleaningStep['kind'], string> = { wash: 'Wash', rinse: 'Rinse', sanitise: 'Sanitise', air_dry: 'Air-dry', custom: 'Step' };

export function toEquipment(r: EquipmentRow): Equipment {
  return { id: r.id, name: r.name, kind: r.kind as Equipment['kind'], isFoodContact: r.isFoodContact, location: r.location, archived: r.archivedAt !== null };
}

const num = (v: string | null) => (v === null ? null : Number(v));

export function toSanitiserProduct(r: SanitiserProductRow): SanitiserProduct {
  return {
    id: r.id, name: r.name, sanitiser: r.sanitiser as SanitiserProduct['sanitiser'], labelMinPpm: Number(r.labelMinPpm), labelMaxPpm: Number(r.labelMaxPpm),
    labelMinTempC: num(r.labelMinTempC), labelContactSeconds: r.labelContactSeconds, labelMaxHardnessPpm: r.labelMaxHardnessPpm, archived: r.archivedAt !== null,
  };
}

export function toTemplate(r: CleaningTemplateRow): CleaningTemplate {
  return { id: r.id, name: r.name, frequency: r.frequency as CleaningTemplate['frequency'], steps: r.steps, equipmentIds: r.equipmentIds, archived: r.archivedAt !== null };
}

const archivedAt = (archived: boolean | undefined, now: Date) => (archived === undefined ? {} : { archivedAt: archived ? now : null });

// ---- Equipment

export async function listEquipment(db: Db, actor: Actor, includeArchived: boolean): Promise<Equipment[]> {
  const rows = await db.select().from(equipment)
    .where(and(eq(equipment.businessId, actor.businessId), includeArchived ? undefined : isNull(equipment.archivedAt)))
    .orderBy(asc(equipment.name));
  return rows.map(toEquipment);
}

export async function createEquipment(db: Db, actor: Actor, raw: EquipmentInput, now: Date): Promise<Equipment> {
  const input = EquipmentInputSchema.parse(raw);
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(equipment).values({ businessId: actor.businessId, ...input, createdAt: now, updatedAt: now }).returning();
    await appendRecordEvent(tx, actor, { entityType: 'equipment', entityId: row!.id, action: 'create', payload: input }, now);
    return toEquipment(row!);
  });
}

export async function updateEquipment(db: Db, actor: Actor, id: string, raw: EquipmentUpdate, now: Date): Promise<Equipment> {
  const { archived, ...fields } = EquipmentUpdateSchema.parse(raw);
  return db.transaction(async (tx) => {
    const [row] = await tx.update(equipment).set({ ...fields, ...archivedAt(archived, now), updatedAt: now })
      .where(and(eq(equipment.id, id), eq(equipment.businessId, actor.businessId))).returning();
    if (!row) throw notFound('That equipment');
    await appendRecordEvent(tx, actor, { entityType: 'equipment', entityId: id, action: archived === undefined ? 'update' : archived ? 'archive' : 'restore', payload: { ...fields, archived } }, now);
    return toEquipment(row);
  });
}

// ---- Sanitiser products

export async function listSanitiserProducts(db: Db, actor: Actor): Promise<SanitiserProduct[]> {
  const rows = await db.select().from(sanitiserProducts).where(eq(sanitiserProducts.businessId, actor.businessId)).orderBy(asc(sanitiserProducts.name));
  return rows.map(toSanitiserProduct);
}

export async function createSanitiserProduct(db: Db, actor: Actor, raw: SanitiserProductInput, now: Date): Promise<SanitiserProduct> {
  const input = SanitiserProductInputSchema.parse(raw);
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(sanitiserProducts).values({
      businessId: actor.businessId, name: input.name, sanitiser: input.sanitiser, labelMinPpm: String(input.labelMinPpm), labelMaxPpm: String(input.labelMaxPpm),
      labelMinTempC: input.labelMinTempC == null ? null : String(input.labelMinTempC), labelContactSeconds: input.labelContactSeconds ?? null,
      labelMaxHardnessPpm: input.labelMaxHardnessPpm ?? null, createdAt: now, updatedAt: now,
    }).returning();
    await appendRecordEvent(tx, actor, { entityType: 'sanitiser_product', entityId: row!.id, action: 'create', payload: input }, now);
    return toSanitiserProduct(row!);
  });
}

/** Products are only archived, never edited: steps keep the label range they were checked against. */
export async function updateSanitiserProduct(db: Db, actor: Actor, id: string, raw: SanitiserProductUpdate, now: Date): Promise<SanitiserProduct> {
  const input = SanitiserProductUpdateSchema.parse(raw);
  return db.transaction(async (tx) => {
    const [row] = await tx.update(sanitiserProducts).set({ ...archivedAt(input.archived, now), updatedAt: now })
      .where(and(eq(sanitiserProducts.id, id), eq(sanitiserProducts.businessId, actor.businessId))).returning();
    if (!row) throw notFound('That sanitiser product');
    await appendRecordEvent(tx, actor, { entityType: 'sanitiser_product', entityId: id, action: input.archived ? 'archive' : 'restore', payload: input }, now);
    return toSanitiserProduct(row);
  });
}

// ---- Templates

function toStoredSteps(steps: NonNullable<CleaningTemplateUpdate['steps']>): StoredCleaningStep[] {
  return steps.map((s, i) => ({ key: `s${i + 1}`, kind: s.kind, label: s.label?.trim() || STEP_NAMES[s.kind] }));
}

async function assertEquipmentIds(tx: DbOrTx, businessId: string, ids: string[]) {
  if (ids.length === 0) return;
  const found = await tx.select({ id: equipment.id }).from(equipment).where(and(eq(equipment.businessId, businessId), inArray(equipment.id, ids)));
  if (found.length !== new Set(ids).size) throw badRequest('Some equipment does not exist.', { equipmentIds: ['Choose equipment of this bakery'] });
}

export async function listCleaningTemplates(db: Db, actor: Actor): Promise<CleaningTemplate[]> {
  const rows = await db.select().from(cleaningTemplates).where(eq(cleaningTemplates.businessId, actor.businessId)).orderBy(asc(cleaningTemplates.name));
  return rows.map(toTemplate);
}

export async function createCleaningTemplate(db: Db, actor: Actor, raw: CleaningTemplateInput, now: Date): Promise<CleaningTemplate> {
  const input = CleaningTemplateInputSchema.parse(raw);
  return db.transaction(async (tx) => {
    await assertEquipmentIds(tx, actor.businessId, input.equipmentIds);
    const [row] = await tx.insert(cleaningTemplates).values({
      businessId: actor.businessId, name: input.name, frequency: input.frequency, steps: toStoredSteps(input.steps), equipmentIds: input.equipmentIds, createdAt: now, updatedAt: now,
    }).returning();
    await appendRecordEvent(tx, actor, { entityType: 'cleaning_template', entityId: row!.id, action: 'create', payload: { name: row!.name, frequency: row!.frequency, steps: row!.steps, equipmentIds: row!.equipmentIds } }, now);
    return toTemplate(row!);
  });
}

/** Changing a template does not touch runs already started: each run keeps its own copy of the steps. */
export async function updateCleaningTemplate(db: Db, actor: Actor, id: string, raw: CleaningTemplateUpdate, now: Date): Promise<CleaningTemplate> {
  const { archived, steps, ...fields } = CleaningTemplateUpdateSchema.parse(raw);
  return db.transaction(async (tx) => {
    if (fields.equipmentIds) await assertEquipmentIds(tx, actor.businessId, fields.equipmentIds);
    const [row] = await tx.update(cleaningTemplates)
      .set({ ...fields, ...(steps ? { steps: toStoredSteps(steps) } : {}), ...archivedAt(archived, now), updatedAt: now })
      .where(and(eq(cleaningTemplates.id, id), eq(cleaningTemplates.businessId, actor.businessId))).returning();
    if (!row) throw notFound('That cleaning checklist');
    await appendRecordEvent(tx, actor, { entityType: 'cleaning_template', entityId: id, action: archived === undefined ? 'update' : archived ? 'archive' : 'restore', payload: { ...fields, steps: steps ? row.steps : undefined, archived } }, now);
    return toTemplate(row);
  });
}
