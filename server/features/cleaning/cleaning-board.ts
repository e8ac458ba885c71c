import type { KitchenBoardSectionProvider } from '../holding/kitchen-board.service';
import { getCleaningDue } from './cleaning.service';

/**
 * Kitchen board: food-contact equipment in use whose 4-hour cleaning (FDA Food Code 2022 4-602.11(C))
 * is due within 30 minutes or overdue. Left off the board when nothing is due.
 */
export const cleaningsDueSection: KitchenBoardSectionProvider = {
  kind: 'cleanings_due',
  order: 15,
  async load(db, actor, now) {
    const due = await getCleaningDue(db, actor.businessId, now);
    const items = due.equipment
      .filter((e) => e.status === 'due_soon' || e.status === 'overdue')
      .map((e) => ({ id: e.equipmentId, title: `Clean and sanitise: ${e.name}`, dueAt: e.nextDueAt!, dueAtLocal: e.nextDueAtLocal!, isOverdue: e.status === 'overdue' }));
    return items.length ? { kind: 'cleanings_due', items } : null;
  },
};
