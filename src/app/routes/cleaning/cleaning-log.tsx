import { ScreenBeingBuilt } from '../../screen-being-built';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export function Component() {
  return <ScreenBeingBuilt title="Cleaning" icon="cleaning" description="Cleaning and sanitising tasks, with the checks you record." />;
}
