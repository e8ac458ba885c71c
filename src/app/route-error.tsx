import { isRouteErrorResponse, Link, useLocation, useRouteError } from 'react-router';
import { isApiError } from '@/lib/api-client';
import { Button } from '@/components/ui/button';
import { Icon } from '@/components/ui/icon';
import { paths, signInPath } from './paths';

function ErrorPanel({ title, children, isServerFault }: { title: string; children: React.ReactNode; isServerFault?: boolean }) {
  return (
    <section role="alert" aria-labelledby="route-error-title" className="rounded-card border border-cherry bg-surface p-6">
      <div className="flex items-start gap-3">
        <Icon name={isServerFault ? 'cross' : 'info'} className="mt-1 size-6 text-cherry" />
        <div className="space-y-3">
          <h1 id="route-error-title" className="text-2xl font-bold">
            {title}
          </h1>
          {children}
        </div>
      </div>
    </section>
  );
}

export function NotFoundContent() {
  return (
    <ErrorPanel title="Page not found">
      <p>There is no page at this address. It may have moved, or the link may be mistyped.</p>
      <p>
        <Link to={paths.kitchen}>Go to the kitchen board</Link>
      </p>
    </ErrorPanel>
  );
}

/**
 * What a screen shows when its loader or render fails: 4xx answers inline with what to do next,
 * server or network faults with a way to retry.
 */
export function RouteErrorBoundary() {
  const error = useRouteError();
  const location = useLocation();
  if (isRouteErrorResponse(error) && error.status === 404) return <NotFoundContent />;
  if (isApiError(error)) {
    if (error.status === 401) {
      return (
        <ErrorPanel title="Your session has ended">
          <p>For safety you are signed out after a while without activity.</p>
          <p>
            <Link to={signInPath(location.pathname + location.search, 'expired')}>Sign in again</Link>
          </p>
        </ErrorPanel>
      );
    }
    if (error.status === 403) {
      return (
        <ErrorPanel title="Not available for your role">
          <p>{error.message}</p>
          <p>Ask the business owner if you need this.</p>
        </ErrorPanel>
      );
    }
    if (error.status === 404) return <NotFoundContent />;
    if (error.isClientError) {
      return (
        <ErrorPanel title="That could not be opened">
          <p>{error.message}</p>
        </ErrorPanel>
      );
    }
  }
  const message = isApiError(error) ? error.message : 'Something went wrong while showing this page.';
  const requestId = isApiError(error) ? error.requestId : undefined;
  return (
    <ErrorPanel title="Something went wrong" isServerFault>
      <p>{message}</p>
      <p>What you saved before this is safe. Reload to try again.</p>
      {requestId ? <p className="text-sm text-muted">Reference: <span className="tabular">{requestId}</span></p> : null}
      <Button onClick={() => window.location.reload()}>Reload the page</Button>
    </ErrorPanel>
  );
}

/** A bare page frame for messages shown outside the layouts. */
export function StandaloneFrame({ children }: { children: React.ReactNode }) {
  return (
    <main id="main" className="mx-auto max-w-2xl p-6">
      <p className="mb-6 text-xl font-black">Crumbtrail</p>
      {children}
    </main>
  );
}

/** The last line of defence: a whole-page frame around RouteErrorBoundary. */
export function RootErrorBoundary() {
  return (
    <StandaloneFrame>
      <RouteErrorBoundary />
    </StandaloneFrame>
  );
}
