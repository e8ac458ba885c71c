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
