import { createBrowserRouter, type ActionFunction, type LoaderFunction, type RouteObject } from 'react-router';
import type { ComponentType } from 'react';
import type { QueryClient } from '@tanstack/react-query';
import { AppLayout, appLayoutLoader } from './layouts/app-layout';
import { AuthLayout } from './layouts/auth-layout';
import { RootErrorBoundary, RouteErrorBoundary } from './route-error';
import { LoadingBlock } from '@/components/ui/spinner';

/** What every file in src/app/routes/<area>/<page>.tsx exports. */
export interface RouteModule {
  Component: ComponentType;
  ErrorBoundary?: ComponentType;
  loader?: (qc: QueryClient) => LoaderFunction;
  action?: (qc: QueryClient) => ActionFunction;
}

/** Lazy route: the module's code loads on first visit; its loader/action get the query client. */
function page(qc: QueryClient, load: () => Promise<RouteModule>): Pick<RouteObject, 'lazy'> {
  return {
    lazy: async () => {
      const m = await load();
      return {
        Component: m.Component,
        ErrorBoundary: m.ErrorBoundary ?? RouteErrorBoundary,
        ...(m.loader ? { loader: m.loader(qc) } : {}),
        ...(m.action ? { action: m.action(qc) } : {}),
      };
    },
  };
}

export function createAppRouter(qc: QueryClient) {
  return createBrowserRouter([
    {
      id: 'root',
      ErrorBoundary: RootErrorBoundary,
      HydrateFallback: () => <LoadingBlock label="Opening Crumbtrail…" />,
      children: [
        {
          Component: AuthLayout,
          ErrorBoundary: RouteErrorBoundary,
          children: [
            { path: 'sign-in', ...page(qc, () => import('./routes/auth/sign-in')) },
            { path: 'sign-up', ...page(qc, () => import('./routes/auth/sign-up')) },
            { path: 'join', ...page(qc, () => import('./routes/auth/join')) },
          ],
        },
        {
          id: 'app',
          loader: appLayoutLoader(qc),
          Component: AppLayout,
          ErrorBoundary: RouteErrorBoundary,
          children: [
            { index: true, ...page(qc, () => import('./routes/kitchen/kitchen-board')) },
            { path: 'batches', ...page(qc, () => import('./routes/batches/batch-list')) },
            { path: 'batches/new', ...page(qc, () => import('./routes/batches/batch-new')) },
            { path: 'batches/:batchId', ...page(qc, () => import('./routes/batches/batch-page')) },
            { path: 'recipes', ...page(qc, () => import('./routes/recipes/recipe-list')) },
            { path: 'recipes/new', ...page(qc, () => import('./routes/recipes/recipe-editor')) },
            { path: 'recipes/allergen-matrix', ...page(qc, () => import('./routes/recipes/allergen-matrix')) },
            { path: 'recipes/:id', ...page(qc, () => import('./routes/recipes/recipe-page')) },
            { path: 'recipes/:id/edit', ...page(qc, () => import('./routes/recipes/recipe-editor')) },
            { path: 'ingredients', ...page(qc, () => import('./routes/ingredients/ingredient-list')) },
            { path: 'ingredients/new', ...page(qc, () => import('./routes/ingredients/ingredient-new')) },
            { path: 'ingredients/import', ...page(qc, () => import('./routes/ingredients/ingredient-import')) },
            { path: 'ingredients/:ingredientId', ...page(qc, () => import('./routes/ingredients/ingredient-page')) },
            { path: 'cleaning', ...page(qc, () => import('./routes/cleaning/cleaning-log')) },
            { path: 'labels', ...page(qc, () => import('./routes/labels/label-list')) },
            { path: 'records', ...page(qc, () => import('./routes/records/records-home')) },
            { path: 'trace', ...page(qc, () => import('./routes/trace/trace-home')) },
            { path: 'sales', ...page(qc, () => import('./routes/sales/sales-log')) },
            { path: 'team', ...page(qc, () => import('./routes/team/team-page')) },
            { path: 'settings', ...page(qc, () => import('./routes/settings/settings-page')) },
            { path: 'settings/rule-profiles', ...page(qc, () => import('./routes/settings/rule-profiles')) },
            { path: 'sent-mail', ...page(qc, () => import('./routes/sent-mail/sent-mail-list')) },
            { path: 'account', ...page(qc, () => import('./routes/account/account-page')) },
          ],
        },
        // The inspector's read-only screen: outside the member layout (no member navigation or sign-in).
        { path: 'inspector', ...page(qc, () => import('./routes/inspector/inspector-view')) },
        { path: '*', ...page(qc, () => import('./routes/errors/not-found')) },
      ],
    },
  ]);
}
