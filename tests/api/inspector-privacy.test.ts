import { describe, expect, test } from 'vitest';
import { makeTestApp } from '../support/app';
import { ApiAgent, businessWithAgents } from '../support/agents';
import { recallChain } from '../support/sales-fixtures';
import { addCalendarDays } from '../../shared/domain/calendar-date';

const t = makeTestApp();
const today = () => t.clock.now.toISOString().slice(0, 10);

// Customer contacts are the owner's alone: an inspector's link and a helper read sales figures, never who bought.
describe('customer contacts stay with the owner', () => {
  test('the inspector records carry no contact fields, inspectors may not read sales, and helpers see sales without contacts', async () => {
    const { owner, helper, business } = await businessWithAgents(t);
    const chain = await recallChain(t, business);
    const contact = { name: 'Wren Castellano', email: 'wren.castellano@example.test', phone: '555-0163', recallConsent: true };
    const created = await owner.post('/api/sales').send({ batchId: chain.productA.id, quantity: 4, unit: 'pieces', amountCents: 1200, channel: 'direct', newCustomer: contact });
    expect(created.status).toBe(201);
    // The owner does get the name back, so the checks below could fail.
    expect(JSON.stringify((await owner.get('/api/sales')).body)).toContain(contact.name);

    const link = await owner.post('/api/inspector-links').send({ inspectorName: 'Millbrook County Health', rangeFrom: addCalendarDays(today(), -7), rangeTo: today() });
    const inspector = new ApiAgent(t.app);
    expect((await inspector.agent.get(new URL(link.body.url).pathname)).status).toBe(303);

    for (const [who, agent] of [['inspector', inspector], ['helper', helper]] as const) {
      const urls = who === 'inspector' ? ['/api/inspector/records'] : ['/api/sales', '/api/sales/cap'];
      for (const url of urls) {
        const res = await agent.get(url);
        expect(res.status, `${who} ${url}`).toBe(200);
        const body = JSON.stringify(res.body);
        for (const secret of [contact.name, contact.email, contact.phone]) expect(body, `${who} ${url}`).not.toContain(secret);
        expect(body, `${who} ${url}`).not.toMatch(/"(customer|contact|email|phone)":/);
      }
      if (who === 'inspector') {
        for (const url of ['/api/sales', '/api/sales/cap', '/api/customers']) expect((await agent.get(url)).status, url).toBe(403);
        continue;
      }
      const list = await agent.get('/api/sales');
      expect(list.body.items.find((s: { id: string }) => s.id === created.body.id)).toMatchObject({ hasCustomer: true, amountCents: 1200 });
      expect((await agent.get('/api/customers')).status).toBe(403);
    }
  });
});
