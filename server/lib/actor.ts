import type { Role } from '../../shared/contracts/auth';

/** Who is acting: a signed-in member, an enrolled kitchen device, or an inspector with a link. */
export interface Actor {
  kind: 'member' | 'device' | 'inspector';
  businessId: string;
  userId: string | null;
  name: string;
  role: Role | 'device' | 'inspector';
  sessionId?: string;
}

declare module 'express-serve-static-core' {
  interface Request {
    /** Set by the actor middleware from the session; absent for anonymous requests. */
    actor?: Actor;
  }
}

declare module 'express-session' {
  interface SessionData {
    kind: 'member' | 'device' | 'inspector';
    userId: string;
    businessId: string;
    deviceId: string;
    inspectorLinkId: string;
    createdAt: number;
    lastSeenAt: number;
    csrfToken: string;
    /** Shown in the member's list of sessions. */
    userAgent: string;
  }
}
