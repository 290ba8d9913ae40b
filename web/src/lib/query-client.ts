import { QueryClient } from '@tanstack/react-query';
import { ApiError } from './api-client';

declare module '@tanstack/react-query' {
  interface Register {
    defaultError: ApiError;
  }
}

/** Client errors (4xx) will not fix themselves: retry only network and server failures. */
function shouldRetry(failureCount: number, error: unknown): boolean {
  if (error instanceof ApiError && error.status >= 400 && error.status < 500) return false;
  return failureCount < 2;
}

export const queryClient = new QueryClient({
  defaultOptions: {
    queries: { retry: shouldRetry, staleTime: 5_000, refetchOnWindowFocus: false },
    mutations: { retry: false },
  },
});
