import { Router } from 'express';
import type { AppDeps } from '../../app';
import { allow, EDITORS, MEMBERS } from '../../middleware/access';
import { IdParamsSchema } from '../../../shared/contracts/errors';
import { CreateSaleInputSchema, CustomerContactInputSchema, ListSalesQuerySchema, UpdateCustomerInputSchema, VoidSaleInputSchema } from '../../../shared/contracts/sales';
import { registerKitchenBoardSection } from '../holding/kitchen-board.service';
import { createCustomer, createSale, eraseCustomer, listCustomers, listSales, salesCapSection, salesCapView, updateCustomerConsent, voidSale } from './sales.service';

// The year's total against the cottage-food cap, on the Kitchen board from 75 %.
registerKitchenBoardSection(salesCapSection);

/** Sales: members read (contacts only for the owner; inspectors never); owners and bakers record and void. */
export function salesRouter({ db, now }: AppDeps) {
  return Router()
    .get('/', allow(...MEMBERS), async (req, res) => {
      res.json(await listSales(db, req.actor!, ListSalesQuerySchema.parse(req.query)));
    })
    .get('/cap', allow(...MEMBERS), async (req, res) => {
      res.json(await salesCapView(db, req.actor!, now()));
    })
    .post('/', allow(...EDITORS), async (req, res) => {
      res.status(201).json(await createSale(db, req.actor!, CreateSaleInputSchema.parse(req.body), now()));
    })
    .post('/:id/void', allow(...EDITORS), async (req, res) => {
      const { id } = IdParamsSchema.parse(req.params);
      res.json(await voidSale(db, req.actor!, id, VoidSaleInputSchema.parse(req.body), now()));
    });
}

/** Customer contacts: the owner's alone, except that a baker may add one while recording a sale. */
export function customersRouter({ db, now }: AppDeps) {
  return Router()
    .get('/', allow('owner'), async (req, res) => {
      res.json({ items: await listCustomers(db, req.actor!) });
    })
    .post('/', allow(...EDITORS), async (req, res) => {
      res.status(201).json(await createCustomer(db, req.actor!, CustomerContactInputSchema.parse(req.body), now()));
    })
    .patch('/:id', allow('owner'), async (req, res) => {
      const { id } = IdParamsSchema.parse(req.params);
      res.json(await updateCustomerConsent(db, req.actor!, id, UpdateCustomerInputSchema.parse(req.body), now()));
    })
    .delete('/:id', allow('owner'), async (req, res) => {
      const { id } = IdParamsSchema.parse(req.params);
      await eraseCustomer(db, req.actor!, id, now());
      res.status(204).end();
    });
}
