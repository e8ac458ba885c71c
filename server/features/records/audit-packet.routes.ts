import { Router, type Request, type Response } from 'express';
import type { AppDeps } from '../../app';
import { allow } from '../../middleware/access';
import { AuditPacketInputSchema, type AuditPacketInput } from '../../../shared/contracts/audit-packet';
import { auditPacketFileName, streamAuditPacket } from './audit-packet.service';
import { PacketAborted } from './packet-zip';

/**
 * POST /api/audit-packets { from, to }: the zip streams back as it is made (no Content-Length).
 * A POST because every export writes a record event.
 */
export function auditPacketsRouter(deps: AppDeps) {
  return Router().post('/', allow('owner'), async (req, res) => {
    await sendAuditPacket(deps, req, res, AuditPacketInputSchema.parse(req.body));
  });
}

/** Streams the zip for a range to the response; shared by the owner's and the inspector's routes. */
export async function sendAuditPacket(deps: AppDeps, req: Request, res: Response, range: AuditPacketInput) {
  res.set({ 'Content-Type': 'application/zip', 'Content-Disposition': `attachment; filename="${auditPacketFileName(range)}"` });
  try {
    await streamAuditPacket(deps, req.actor!, range, res);
  } catch (err) {
    if (err instanceof PacketAborted) return;
    if (!res.headersSent) {
      res.removeHeader('Content-Disposition');
      throw err;
    }
    deps.logger.error({ err: (err as Error).message, requestId: res.locals.requestId }, 'audit packet failed while streaming');
  }
}
