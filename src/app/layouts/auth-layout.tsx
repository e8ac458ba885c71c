import { Outlet } from 'react-router';

/** Signed-out pages: sign-in, sign-up, joining a team. */
export function AuthLayout() {
  return (
    <div className="min-h-screen">
      <a href="#main" className="skip-link sr-only focus:not-sr-only focus:absolute focus:left-4 focus:top-4 focus:z-50 focus:rounded-control focus:bg-surface focus:p-3">
        Skip to main content
      </a>
      <header className="border-b border-hairline bg-surface">
        <div className="mx-auto flex max-w-5xl items-center gap-2 px-4 py-3">
          <span aria-hidden="true" className="inline-block size-3 rounded-full bg-berry" />
          <span className="text-xl font-black tracking-tight">Crumbtrail</span>
          <span className="ml-2 hidden text-sm text-muted sm:inline">Food-safety records for home bakeries</span>
        </div>
      </header>
      <main id="main" tabIndex={-1} className="mx-auto max-w-md px-4 py-8 sm:py-12">
        <Outlet />
      </main>
    </div>
  );
}
