import type { DemoAccount } from '../../../shared/contracts/auth';

// Demo mode only (the default of `npm start` on loopback): shown on the sign-in page and in the README.
// Outside demo mode these accounts are never created.
export const DEMO_ACCOUNTS: DemoAccount[] = [
  { email: 'maren@juniperlane.test', password: 'frosting-owner-demo', role: 'owner', displayName: 'Maren Holt' },
  { email: 'tobias@juniperlane.test', password: 'sprinkles-baker-demo', role: 'baker', displayName: 'Tobias Reyes' },
  { email: 'ivy@juniperlane.test', password: 'whisk-helper-demo', role: 'helper', displayName: 'Ivy Chen' },
];
