import { ScreenBeingBuilt } from '../../screen-being-built';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export function Component() {
  return <ScreenBeingBuilt title="Account" icon="account" description="Your sign-in details and sessions." />;
}
