import '@fontsource/fira-sans/latin-400.css';
import '@fontsource/fira-sans/latin-700.css';
import './app/index.css';
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { AppProvider } from './app/provider.tsx';
import { createQueryClient } from './app/query-client.ts';
import { AppRouter } from './app/router.tsx';
import { ApiError } from './lib/api-client.ts';

const container = document.getElementById('root');
if (!container) throw new Error('index.html has no #root element');

const queryClient = createQueryClient();

// A section's error boundary shows what went wrong in the page. A refusal of the API (4xx: no plant yet,
// not your role, a bad window) is an answer the person reads there, not a fault of the app: only the
// rest reaches the console, as React would report it.
createRoot(container, {
  onCaughtError: (error) => {
    if (error instanceof ApiError && error.status >= 400 && error.status < 500) return;
    console.error(error);
  },
}).render(
  <StrictMode>
    <AppProvider queryClient={queryClient}>
      <AppRouter queryClient={queryClient} />
    </AppProvider>
  </StrictMode>,
);
