import { ScreenBeingBuilt } from '../../screen-being-built';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export function Component() {
  return <ScreenBeingBuilt title="Labels" icon="label" description="Product labels with the ingredient statement, allergens and net quantity." />;
}
