import '@fontsource/space-grotesk/400.css';
import '@fontsource/space-grotesk/500.css';
import '@fontsource/space-grotesk/700.css';
import './styles.css';
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { RouterProvider } from 'react-router/dom';
import { createAppRouter } from './app/router';

const queryClient = new QueryClient({
  defaultOptions: {
    // Data changes mostly from this one person's own actions, which invalidate what they touch.
    queries: { staleTime: 30_000 },
  },
});

const router = createAppRouter();

const rootElement = document.getElementById('root');
if (!rootElement) throw new Error('index.html is missing its #root element');

createRoot(rootElement).render(
  <StrictMode>
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>
  </StrictMode>,
);
