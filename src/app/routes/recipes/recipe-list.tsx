import { ScreenBeingBuilt } from '../../screen-being-built';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export function Component() {
  return <ScreenBeingBuilt title="Recipes" icon="recipe" description="Recipes with their ingredients, allergens and label wording." />;
}
