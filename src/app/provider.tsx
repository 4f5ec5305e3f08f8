import { QueryClientProvider } from '@tanstack/react-query';
import { RouterProvider } from 'react-router/dom';
import { queryClient } from '@/lib/query-client';
import { createAppRouter } from '@/app/router';

const router = createAppRouter(queryClient);

/** The whole client: one query cache and one data router. */
export function App() {
  return (
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>
  );
}
