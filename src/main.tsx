import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { RouterProvider } from 'react-router';
import { QueryClientProvider } from '@tanstack/react-query';
import '@fontsource/lato/400.css';
import '@fontsource/lato/700.css';
import '@fontsource/lato/900.css';
import './styles/app.css';
import { createQueryClient } from './lib/query-client';
import { createAppRouter } from './app/router';
import { signInPath } from './app/paths';
import { forgetSession } from './features/auth/api';
import { ToastProvider } from './components/ui/toast';

// A 401 anywhere means the session ended: forget it and go to sign-in, coming back here after.
// Forms keep their input as drafts in this tab (src/lib/form-drafts.ts), so nothing typed is lost.
const queryClient = createQueryClient({
  onUnauthenticated: () => {
    const { pathname, search } = window.location;
    // The inspector screen shows its own "link ended" page instead of sign-in.
    if (pathname === '/inspector') return;
    forgetSession(queryClient);
    if (pathname === '/sign-in') return;
    void router.navigate(signInPath(pathname + search, 'expired'), { replace: true });
  },
});
const router = createAppRouter(queryClient);

createRoot(document.getElementById('root')!).render(
  <StrictMode>
    <QueryClientProvider client={queryClient}>
      <ToastProvider>
        <RouterProvider router={router} />
      </ToastProvider>
    </QueryClientProvider>
  </StrictMode>,
);
