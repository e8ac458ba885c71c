import { ScreenBeingBuilt } from '../../screen-being-built';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export function Component() {
  return <ScreenBeingBuilt title="Trace & recall" icon="trace" description="Follow a lot forwards and backwards, and run a recall." />;
}
