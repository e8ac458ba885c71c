import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import type { IconName } from '@/components/ui/icon';

/** The honest state of a screen whose feature has not been built yet. */
export function ScreenBeingBuilt({ title, description, icon }: { title: string; description: string; icon?: IconName }) {
  return (
    <>
      <PageHeader title={title} description={description} />
      <EmptyState title="This screen is being built" icon={icon}>
        <p>Nothing here works yet. When it is ready, this is where it will appear; nothing you do elsewhere is lost.</p>
      </EmptyState>
    </>
  );
}
