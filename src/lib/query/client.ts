import { QueryClient } from '@tanstack/react-query';

/**
 * One QueryClient for every island on a page: islands hydrate separately, so the client lives on
 * the window and each island's provider picks up the same one (one cache, one poll per query).
 */
declare global {
  interface Window {
    __heatlayerQueryClient?: QueryClient;
  }
}

export function queryClient(): QueryClient {
  const make = () =>
    new QueryClient({
      defaultOptions: {
        queries: {
          staleTime: 5_000,
          retry: (count, err) => !(err instanceof ApiError && err.status < 500) && count < 2,
          refetchOnWindowFocus: true,
        },
      },
    });
  if (typeof window === 'undefined') return make();
  window.__heatlayerQueryClient ??= make();
  return window.__heatlayerQueryClient;
}

/** An answer that was not 2xx, with the API's problem fields. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: { field: string; message: string }[],
  ) {
    super(message);
  }
}

export async function fetchJson<T>(url: string, init?: RequestInit): Promise<T> {
  const res = await fetch(url, {
    credentials: 'same-origin',
    headers: { accept: 'application/json', ...(init?.body ? { 'content-type': 'application/json' } : {}) },
    ...init,
  });
  if (!res.ok) {
    let body: { error?: { code?: string; message?: string; fields?: { field: string; message: string }[] } } = {};
    try {
      body = await res.json();
    } catch {
      /* not JSON: keep the status */
    }
    if (res.status === 401 && typeof window !== 'undefined') {
      window.location.assign(`/signin?next=${encodeURIComponent(window.location.pathname + window.location.search)}`);
    }
    throw new ApiError(
      res.status,
      body.error?.code ?? 'HttpError',
      body.error?.message ?? `The server answered ${res.status}.`,
      body.error?.fields,
    );
  }
  // 204 No Content (a delete, say) has no body to read.
  return (res.status === 204 ? null : await res.json()) as T;
}
