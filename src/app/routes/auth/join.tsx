import { Link } from 'react-router';
import { EmptyState } from '@/components/ui/empty-state';
import { paths } from '../../paths';

export { RouteErrorBoundary as ErrorBoundary } from '../../route-error';

export function Component() {
  return (
    <div>
      <h1 className="text-3xl font-bold">Join a team</h1>
      <div className="mt-6">
        <EmptyState title="This screen is being built" icon="team">
          <p>
            Accepting an invite is not ready yet. Ask the business owner to check back soon, or <Link to={paths.signIn}>sign in</Link> if you already have an account.
          </p>
        </EmptyState>
      </div>
    </div>
  );
}
