import { Router } from 'express';
import type { AppDeps } from '../../app';
import { allow } from '../../middleware/access';
import { CreateDeviceInputSchema, DeviceParamsSchema, EnrolDeviceInputSchema } from '../../../shared/contracts/devices';
import { createDevice, currentDevice, DEVICE_SESSION_LIFETIME_MS, enrolDevice, listDevices, revokeDevice } from './devices.service';
import { startDeviceSession } from '../auth/session-helpers';
import { buildSessionInfo } from '../auth/session-info';

export function devicesRouter(deps: AppDeps) {
  const { db } = deps;
  return Router()
    .get('/', allow('owner'), async (req, res) => {
      res.json({ devices: await listDevices(db, req.actor!, deps.now()) });
    })
    .post('/', allow('owner'), async (req, res) => {
      const input = CreateDeviceInputSchema.parse(req.body);
      res.status(201).json(await createDevice(db, req.actor!, input, deps.now()));
    })
    .delete('/:deviceId', allow('owner'), async (req, res) => {
      const { deviceId } = DeviceParamsSchema.parse(req.params);
      await revokeDevice(db, req.actor!, deviceId, deps.now());
      res.status(204).end();
    })
    .post('/enrol', allow('public'), async (req, res) => {
      const { code } = EnrolDeviceInputSchema.parse(req.body);
      const device = await enrolDevice(db, code, deps.now());
      await startDeviceSession(req, device, deps.now(), DEVICE_SESSION_LIFETIME_MS);
      req.actor = { kind: 'device', businessId: device.businessId, userId: null, name: device.name, role: 'device' };
      res.status(201).json(await buildSessionInfo(deps, req));
    })
    .get('/current', allow('device'), async (req, res) => {
      res.json(await currentDevice(db, req.actor!, req.session.deviceId!));
    });
}
