import { QueryClientProvider } from '@tanstack/react-query';
import type { ComponentType } from 'react';
import { queryClient } from './client';

/** Wraps an island in the page's shared QueryClient. */
export function withQuery<P extends object>(Island: ComponentType<P>): ComponentType<P> {
  function WithQuery(props: P) {
    return (
      <QueryClientProvider client={queryClient()}>
        <Island {...props} />
      </QueryClientProvider>
    );
  }
  WithQuery.displayName = `WithQuery(${Island.displayName ?? Island.name})`;
  return WithQuery;
}
