import { beforeAll, describe, expect, test } from 'vitest';
import { eq, inArray } from 'drizzle-orm';
import { makeTestApp } from '../support/app';
import { businessWithAgents } from '../support/agents';
import { uniqueSuffix } from '../support/db';
import { ingredientVersions } from '../../server/db/schema/ingredients';
import { recordEvents } from '../../server/db/schema/record-events';

const t = makeTestApp();
type Agents = Awaited<ReturnType<typeof businessWithAgents>>;
let a: Agents;
let other: Agents;
let tag: string;
let csv: string;

beforeAll(async () => {
  a = await businessWithAgents(t);
  other = await businessWithAgents(t);
  tag = uniqueSuffix();
  // Row 2 and 5 are good; 3 lacks a tree nut's kind (21 U.S.C. 343(w)(2)); 4 has a bad number and yes/no; 6 has no name;
  // 7 repeats row 2's name.
  csv = [
    'Label Name,sub_ingredients,allergens,sulphites_mg_per_kg,needs_tcs,supplier,supplier_item_code',
    `"Candy coating ${tag}","sugar; palm kernel oil; whey powder; nonfat milk; soy lecithin","milk; soy",,no,Millbrook Baking Supply,WCC-25`,
    `Nut flour ${tag},,tree_nut,,no,,`,
    `Golden raisins ${tag},"raisins; sulphur dioxide",sulphites,plenty,sometimes,,`,
    `Cream cheese ${tag},"pasteurized milk; cream; salt",milk,,yes,Dairy Co,CC-8`,
    `,sugar,,,,,`,
    `candy coating ${tag},,,,,,`,
  ].join('\r\n');
});

const namesInDb = async (businessId: string) =>
  (await t.db.select({ n: ingredientVersions.labelName }).from(ingredientVersions).where(eq(ingredientVersions.businessId, businessId))).map((r) => r.n);

describe('POST /api/ingredients/import/preview', () => {
  test('returns each row with its errors (row number + column + message) and writes nothing', async () => {
    const before = await t.db.select().from(recordEvents).where(eq(recordEvents.businessId, a.business.businessId));
    const res = await a.baker.post('/api/ingredients/import/preview').send({ csv });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ validCount: 2, errorCount: 4, fileErrors: [] });
    const errs = res.body.rows.flatMap((r: { errors: unknown[] }) => r.errors);
    expect(errs).toEqual(expect.arrayContaining([
      expect.objectContaining({ rowNumber: 3, field: 'allergens', message: expect.stringMatching(/tree nut/) }),
      expect.objectContaining({ rowNumber: 4, field: 'sulphites_mg_per_kg' }),
      expect.objectContaining({ rowNumber: 4, field: 'needs_tcs' }),
      expect.objectContaining({ rowNumber: 6, field: 'label_name' }),
      expect.objectContaining({ rowNumber: 7, field: 'label_name', message: 'Same name as row 2.' }),
    ]));
    expect(res.body.rows[0].ingredient).toMatchObject({ subIngredients: ['sugar', 'palm kernel oil', 'whey powder', 'nonfat milk', 'soy lecithin'], allergens: [{ source: 'milk' }, { source: 'soy' }] });
    expect(await namesInDb(a.business.businessId)).toEqual([]);
    expect(await t.db.select().from(recordEvents).where(eq(recordEvents.businessId, a.business.businessId))).toHaveLength(before.length);
  });

  test('a multipart CSV file works the same; a binary file answers 415', async () => {
    const res = await a.owner.post('/api/ingredients/import/preview').attach('file', Buffer.from(csv), { filename: 'shelf.csv', contentType: 'text/csv' });
    expect(res.body.validCount).toBe(2);
    const png = Buffer.from('89504e470d0a1a0a0000000d49484452', 'hex');
    expect((await a.owner.post('/api/ingredients/import/preview').attach('file', png, 'shelf.csv')).status).toBe(415);
  });

  test('an unknown column or missing label_name is a file error', async () => {
    const res = await a.owner.post('/api/ingredients/import/preview').send({ csv: 'name,colour\nflour,white' });
    expect(res.body.fileErrors.join(' ')).toMatch(/label_name/);
    expect(res.body.fileErrors.join(' ')).toMatch(/Unknown columns: name, colour/);
  });

  test('a helper answers 403', async () => {
    expect((await a.helper.post('/api/ingredients/import/preview').send({ csv })).status).toBe(403);
  });
});

describe('POST /api/ingredients/import/confirm', () => {
  test('writes only the valid rows in one transaction, one record event each; a re-run reports them as existing', async () => {
    const res = await a.owner.post('/api/ingredients/import/confirm').send({ csv });
    expect(res.status).toBe(201);
    expect(res.body.created.map((c: { rowNumber: number }) => c.rowNumber)).toEqual([2, 5]);
    expect(res.body.skipped.map((r: { rowNumber: number }) => r.rowNumber)).toEqual([3, 4, 6, 7]);
    expect((await namesInDb(a.business.businessId)).sort()).toEqual([`Candy coating ${tag}`, `Cream cheese ${tag}`]);
    const ids = res.body.created.map((c: { id: string }) => c.id);
    const events = await t.db.select().from(recordEvents).where(inArray(recordEvents.entityId, ids));
    expect(events.map((e) => e.action)).toEqual(['create', 'create']);
    const cheese = await a.owner.get(`/api/ingredients/${ids[1]}`);
    expect(cheese.body).toMatchObject({ needsTimeTemperatureControl: true, supplierItemCode: 'CC-8' });
    expect(await namesInDb(other.business.businessId)).toEqual([]);

    const again = await a.owner.post('/api/ingredients/import/confirm').send({ csv });
    expect(again.status).toBe(400);
    const preview = await a.owner.post('/api/ingredients/import/preview').send({ csv });
    expect(preview.body.rows[0].errors[0].message).toMatch(/already on your ingredient list/);
  });
});
