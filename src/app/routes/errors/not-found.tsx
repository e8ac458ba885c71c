import { NotFoundContent, RouteErrorBoundary, StandaloneFrame } from '../../route-error';

export { RouteErrorBoundary as ErrorBoundary };

export function Component() {
  return (
    <StandaloneFrame>
      <NotFoundContent />
    </StandaloneFrame>
  );
}
