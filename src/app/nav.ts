import type { Role } from '@shared/contracts/auth';
import type { IconName } from '@/components/ui/icon';
import { paths } from './paths';

export interface NavItem {
  label: string;
  to: string;
  icon: IconName;
  /** Roles that see this screen in the navigation and may open it. */
  roles: readonly Role[];
}

const ALL: readonly Role[] = ['owner', 'baker', 'helper'];
const EDITORS: readonly Role[] = ['owner', 'baker'];
const OWNER: readonly Role[] = ['owner'];

/**
 * The one list of signed-in screens, in menu order. Owners see everything; bakers run production
 * (recipes, ingredients, batches and holding, labels, sales); helpers work the kitchen board, read
 * batches, recipes and ingredients, and do the cleaning.
 */
export const NAV_ITEMS: readonly NavItem[] = [
  { label: 'Kitchen board', to: paths.kitchen, icon: 'board', roles: ALL },
  { label: 'Batches', to: paths.batches, icon: 'batch', roles: ALL },
  { label: 'Recipes', to: paths.recipes, icon: 'recipe', roles: ALL },
  { label: 'Ingredients', to: paths.ingredients, icon: 'ingredient', roles: ALL },
  { label: 'Cleaning', to: paths.cleaning, icon: 'cleaning', roles: ALL },
  { label: 'Labels', to: paths.labels, icon: 'label', roles: EDITORS },
  { label: 'Sales', to: paths.sales, icon: 'sales', roles: EDITORS },
  { label: 'Records', to: paths.records, icon: 'records', roles: OWNER },
  { label: 'Trace & recall', to: paths.trace, icon: 'trace', roles: OWNER },
  { label: 'Team', to: paths.team, icon: 'team', roles: OWNER },
  { label: 'Settings', to: paths.settings, icon: 'settings', roles: OWNER },
  { label: 'Sent mail', to: paths.sentMail, icon: 'mail', roles: OWNER },
  { label: 'Account', to: paths.account, icon: 'account', roles: ALL },
];

export function navItemsFor(role: Role): NavItem[] {
  return NAV_ITEMS.filter((item) => item.roles.includes(role));
}

/** The nav item that owns a pathname (`/batches/123` → Batches), for the role check. */
export function navItemForPath(pathname: string): NavItem | undefined {
  return NAV_ITEMS.find((item) => (item.to === '/' ? pathname === '/' : pathname === item.to || pathname.startsWith(`${item.to}/`)));
}

export const ROLE_LABELS: Record<Role, string> = { owner: 'Owner', baker: 'Baker', helper: 'Helper' };
