import { expect } from 'vitest';
import type { ApiAgent } from './agents';

// Sanitiser readings used across the cleaning tests, each with its published source.
/** Passes: "chlorine 50 ppm, 80 °F, pH 7.5, 8 s" (FDA Food Code 2022 4-501.114(A), 4-703.11(C)). */
export const CHLORINE_PASS = { sanitiser: 'chlorine', concentrationPpm: 50, waterTemperature: { value: 80, unit: 'F' }, ph: 7.5, contactSeconds: 8 } as const;
/** Fails: "chlorine 50 ppm, 80 °F, pH 9" needs 100 °F at pH ≤ 10 (4-501.114(A)). */
export const CHLORINE_FAIL = { sanitiser: 'chlorine', concentrationPpm: 50, waterTemperature: { value: 80, unit: 'F' }, ph: 9, contactSeconds: 10 } as const;

/** One food-contact bowl and a wash–rinse–sanitise–air-dry checklist covering it, made by `editor`. */
export async function cleaningSetup(editor: ApiAgent, frequency: 'daily' | 'per_batch' = 'daily') {
  const eq = await editor.post('/api/equipment').send({ name: 'Stand mixer bowl', kind: 'utensil', isFoodContact: true, location: 'Counter by the window' });
  expect(eq.status).toBe(201);
  const tpl = await editor.post('/api/cleaning-templates').send({
    name: frequency === 'daily' ? 'Close of day' : 'After each batch', frequency,
    steps: [{ kind: 'wash' }, { kind: 'rinse' }, { kind: 'sanitise' }, { kind: 'air_dry' }], equipmentIds: [eq.body.id],
  });
  expect(tpl.status).toBe(201);
  return { equipmentId: eq.body.id as string, templateId: tpl.body.id as string };
}

/** Starts a run and records wash, rinse, a passing chlorine sanitise and air-dry as `who`. */
export async function completedRun(who: ApiAgent, templateId: string, extra: { batchId?: string } = {}) {
  const started = await who.post('/api/cleaning-runs').send({ templateId, ...extra });
  expect(started.status).toBe(201);
  const id = started.body.id as string;
  for (const step of [{ stepKey: 's1' }, { stepKey: 's2' }, { stepKey: 's3', sanitising: CHLORINE_PASS }, { stepKey: 's4' }]) {
    const res = await who.post(`/api/cleaning-runs/${id}/steps`).send(step);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
  }
  return id;
}
