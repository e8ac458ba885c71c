import { ScreenBeingBuilt } from '../../screen-being-built';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export function Component() {
  return <ScreenBeingBuilt title="Team" icon="team" description="Invite people, set their roles, and turn off access." />;
}
