import { Router } from 'express';
import type { AppDeps } from '../../app';
import { allow, MEMBERS } from '../../middleware/access';
import { UpdateBusinessInputSchema } from '../../../shared/contracts/business';
import { getBusiness, updateBusiness } from './business.service';

export function businessRouter(deps: AppDeps) {
  const { db } = deps;
  return Router()
    .get('/', allow(...MEMBERS), async (req, res) => {
      res.json(await getBusiness(db, req.actor!));
    })
    .patch('/', allow('owner'), async (req, res) => {
      const input = UpdateBusinessInputSchema.parse(req.body);
      res.json(await updateBusiness(db, req.actor!, input, deps.now()));
    });
}
