import { ScreenBeingBuilt } from '../../screen-being-built';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export function Component() {
  return <ScreenBeingBuilt title="Batches" icon="batch" description="Every batch from mixing to sold, with its lot code and holding times." />;
}
