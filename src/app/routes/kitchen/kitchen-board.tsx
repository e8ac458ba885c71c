import { ScreenBeingBuilt } from '../../screen-being-built';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export function Component() {
  return <ScreenBeingBuilt title="Kitchen board" icon="board" description="Today's batches, holding times and cleaning, at arm's length." />;
}
