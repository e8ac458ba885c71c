import { ScreenBeingBuilt } from '../../screen-being-built';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export function Component() {
  return <ScreenBeingBuilt title="Ingredients" icon="ingredient" description="What goes into your bakes: suppliers, allergens and lots received." />;
}
