import { Router } from 'express';
import type { AppDeps } from '../../app';
import { allow } from '../../middleware/access';
import { listPendingMail, listSentMail } from './mail.service';

export function sentMailRouter(deps: AppDeps) {
  const { db } = deps;
  return Router().get('/', allow('owner'), async (req, res) => {
    const [messages, pending] = await Promise.all([listSentMail(db, req.actor!), listPendingMail(db, req.actor!)]);
    res.json({ capturing: deps.config.mailCapturing ?? true, messages, pending });
  });
}
