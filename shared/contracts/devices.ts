import { z } from 'zod';
import { NameSchema } from './team';
const UuidSchema = z.string().uuid('That id is not valid');

/** Kitchen display devices (owner). */
export const DeviceSchema = z.object({
  id: z.string().uuid(),
  name: z.string(),
  status: z.enum(['awaiting_enrolment', 'active', 'revoked', 'expired']),
  createdAt: z.string(),
  enrolledAt: z.string().nullable(),
  lastSeenAt: z.string().nullable(),
  sessionExpiresAt: z.string().nullable(),
  enrolmentExpiresAt: z.string(),
});
export type Device = z.infer<typeof DeviceSchema>;
export const DeviceListSchema = z.object({ devices: z.array(DeviceSchema) });
export type DeviceList = z.infer<typeof DeviceListSchema>;

/** POST /api/devices (owner). */
export const CreateDeviceInputSchema = z.object({ name: NameSchema }).strict();
export type CreateDeviceInput = z.infer<typeof CreateDeviceInputSchema>;
/** 201 answer: the enrolment code is shown once, as text to type on the tablet. */
export const CreatedDeviceSchema = z.object({ device: DeviceSchema, enrolmentCode: z.string() });
export type CreatedDevice = z.infer<typeof CreatedDeviceSchema>;

export const DeviceParamsSchema = z.object({ deviceId: UuidSchema });

/** POST /api/devices/enrol (public, on the tablet): answers SessionInfoSchema with kind 'device'. */
export const EnrolDeviceInputSchema = z.object({ code: z.string().trim().min(1, 'Enter the enrolment code').max(100, 'That code is not valid') }).strict();
export type EnrolDeviceInput = z.infer<typeof EnrolDeviceInputSchema>;

/** GET /api/devices/current (the device itself): which tablet this is and for which business. */
export const CurrentDeviceSchema = z.object({ id: z.string().uuid(), name: z.string(), businessName: z.string(), sessionExpiresAt: z.string() });
export type CurrentDevice = z.infer<typeof CurrentDeviceSchema>;
