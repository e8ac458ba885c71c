import { Router } from 'express';
import type { AppDeps } from '../../app';
import { allow, MEMBERS } from '../../middleware/access';
import {
  CopyRuleProfileInputSchema, RuleProfileParamsSchema, SaveRuleProfileVersionInputSchema,
} from '../../../shared/contracts/custom-rule-profiles';
import { copyRuleProfile, getRuleProfileDetail, listRuleProfiles, saveRuleProfileVersion } from './rule-profiles.service';

export function ruleProfilesRouter(deps: AppDeps) {
  const { db } = deps;
  return Router()
    .get('/', allow(...MEMBERS), async (req, res) => {
      res.json({ profiles: await listRuleProfiles(db, req.actor!) });
    })
    .post('/', allow('owner'), async (req, res) => {
      const input = CopyRuleProfileInputSchema.parse(req.body);
      res.status(201).json(await copyRuleProfile(db, req.actor!, input, deps.now()));
    })
    .get('/:id', allow(...MEMBERS), async (req, res) => {
      const { id } = RuleProfileParamsSchema.parse(req.params);
      res.json(await getRuleProfileDetail(db, req.actor!, id));
    })
    .post('/:id/versions', allow('owner'), async (req, res) => {
      const { id } = RuleProfileParamsSchema.parse(req.params);
      const input = SaveRuleProfileVersionInputSchema.parse(req.body);
      res.status(201).json(await saveRuleProfileVersion(db, req.actor!, id, input, deps.now()));
    });
}
