import { and, desc, eq } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { devices, type DeviceRow } from '../../db/schema/devices';
import { businesses } from '../../db/schema/business';
import type { Actor } from '../../lib/actor';
import { HttpError, conflict, notFound } from '../../lib/http-error';
import { codeHash, newOneTimeCode } from '../../lib/tokens';
import type { ActorResolver } from '../../middleware/actor';
import type { CreateDeviceInput, CreatedDevice, CurrentDevice, Device } from '../../../shared/contracts/devices';
import { appendRecordEvent } from '../records/record-events.service';
import { endDeviceSessions } from '../auth/session-store';

// The owner types the code on the tablet within the hour; the device session then lasts 90 days
// (common practice for unattended kiosk sessions; revocable at any time).
export const ENROLMENT_CODE_LIFETIME_MS = 60 * 60 * 1000;
export const DEVICE_SESSION_LIFETIME_MS = 90 * 24 * 60 * 60 * 1000;
// lastSeenAt is written at most this often, not on every request.
const LAST_SEEN_RESOLUTION_MS = 5 * 60 * 1000;

function deviceStatus(row: DeviceRow, now: Date): Device['status'] {
  if (row.revokedAt) return 'revoked';
  if (!row.enrolledAt) return row.enrolmentExpiresAt <= now ? 'expired' : 'awaiting_enrolment';
  return row.sessionExpiresAt && row.sessionExpiresAt <= now ? 'expired' : 'active';
}

const iso = (d: Date | null) => (d ? d.toISOString() : null);

function toDevice(row: DeviceRow, now: Date): Device {
  return {
    id: row.id,
    name: row.name,
    status: deviceStatus(row, now),
    createdAt: row.createdAt.toISOString(),
    enrolledAt: iso(row.enrolledAt),
    lastSeenAt: iso(row.lastSeenAt),
    sessionExpiresAt: iso(row.sessionExpiresAt),
    enrolmentExpiresAt: row.enrolmentExpiresAt.toISOString(),
  };
}

/** Registers a tablet and returns its one-time enrolment code (stored only as a SHA-256). */
export async function createDevice(db: Db, actor: Actor, input: CreateDeviceInput, now: Date): Promise<CreatedDevice> {
  const enrolmentCode = newOneTimeCode();
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(devices)
      .values({
        businessId: actor.businessId,
        name: input.name,
        enrolmentCodeHash: codeHash(enrolmentCode),
        enrolmentExpiresAt: new Date(now.getTime() + ENROLMENT_CODE_LIFETIME_MS),
        createdByUserId: actor.userId!,
        createdAt: now,
        updatedAt: now,
      })
      .returning();
    await appendRecordEvent(tx, actor, { entityType: 'device', entityId: row!.id, action: 'create', payload: { name: input.name } }, now);
    return { device: toDevice(row!, now), enrolmentCode };
  });
}

export async function listDevices(db: Db, actor: Actor, now: Date): Promise<Device[]> {
  const rows = await db.select().from(devices).where(eq(devices.businessId, actor.businessId)).orderBy(desc(devices.createdAt));
  return rows.map((r) => toDevice(r, now));
}

/** Revoking ends the device's session at once; its next request is anonymous. */
export async function revokeDevice(db: Db, actor: Actor, deviceId: string, now: Date): Promise<void> {
  await db.transaction(async (tx) => {
    const [row] = await tx.select().from(devices).where(and(eq(devices.id, deviceId), eq(devices.businessId, actor.businessId))).for('update');
    if (!row) throw notFound('That device');
    if (row.revokedAt) throw conflict('That device is already revoked.');
    await tx.update(devices).set({ revokedAt: now, updatedAt: now }).where(eq(devices.id, row.id));
    const endedSessions = await endDeviceSessions(tx, row.id);
    await appendRecordEvent(tx, actor, { entityType: 'device', entityId: row.id, action: 'revoke', payload: { name: row.name, endedSessions } }, now);
  });
}

/** Redeems an enrolment code once; the caller then starts the device session. */
export async function enrolDevice(db: Db, code: string, now: Date): Promise<DeviceRow> {
  return db.transaction(async (tx) => {
    const [row] = await tx.select().from(devices).where(eq(devices.enrolmentCodeHash, codeHash(code))).for('update');
    if (!row || deviceStatus(row, now) !== 'awaiting_enrolment') {
      throw new HttpError(410, 'gone', 'That enrolment code is not valid any more. Ask the owner for a new one.', { code: ['That enrolment code is not valid any more.'] });
    }
    const sessionExpiresAt = new Date(now.getTime() + DEVICE_SESSION_LIFETIME_MS);
    const [updated] = await tx.update(devices).set({ enrolledAt: now, lastSeenAt: now, sessionExpiresAt, updatedAt: now }).where(eq(devices.id, row.id)).returning();
    await appendRecordEvent(tx, { businessId: row.businessId, userId: null, name: row.name, role: 'device' }, { entityType: 'device', entityId: row.id, action: 'enrol', payload: { sessionExpiresAt: sessionExpiresAt.toISOString() } }, now);
    return updated!;
  });
}

/** Resolves a 'device' session to a device actor while the device is enrolled, unrevoked and unexpired. */
export const deviceActorResolver: ActorResolver = async (db, session, now) => {
  if (!session.deviceId || !session.businessId) return undefined;
  const [row] = await db.select().from(devices).where(and(eq(devices.id, session.deviceId), eq(devices.businessId, session.businessId)));
  if (!row || deviceStatus(row, now) !== 'active') return undefined;
  if (!row.lastSeenAt || now.getTime() - row.lastSeenAt.getTime() > LAST_SEEN_RESOLUTION_MS) {
    await db.update(devices).set({ lastSeenAt: now }).where(eq(devices.id, row.id));
  }
  return { kind: 'device', businessId: row.businessId, userId: null, name: row.name, role: 'device' };
};

export async function currentDevice(db: Db, actor: Actor, deviceId: string): Promise<CurrentDevice> {
  const [row] = await db
    .select({ id: devices.id, name: devices.name, businessName: businesses.name, sessionExpiresAt: devices.sessionExpiresAt })
    .from(devices)
    .innerJoin(businesses, eq(businesses.id, devices.businessId))
    .where(and(eq(devices.id, deviceId), eq(devices.businessId, actor.businessId)));
  if (!row) throw notFound('That device');
  return { ...row, sessionExpiresAt: row.sessionExpiresAt!.toISOString() };
}
