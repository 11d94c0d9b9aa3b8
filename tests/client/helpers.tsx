import { render } from '@testing-library/react';
import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { createMemoryRouter, RouterProvider } from 'react-router';
import { vi } from 'vitest';
import { routes } from '@/router';

export interface MockResponse {
  status?: number;
  body?: unknown;
  headers?: Record<string, string>;
}

type Handler = MockResponse | ((req: { url: string; method: string; body: unknown }) => MockResponse | Promise<MockResponse>);

/**
 * Stubs global fetch with a table of "METHOD /path" handlers (query string included when given in the key).
 * Unknown requests answer 404 not_found, like the server. Returns the mock to inspect calls.
 */
export function mockApi(handlers: Record<string, Handler>) {
  const fetchMock = vi.fn(async (input: RequestInfo | URL, init?: RequestInit) => {
    const url = typeof input === 'string' ? input : input instanceof URL ? input.pathname + input.search : input.url;
    const method = (init?.method ?? 'GET').toUpperCase();
    const body = typeof init?.body === 'string' ? JSON.parse(init.body) : undefined;
    const handler = handlers[`${method} ${url}`] ?? handlers[`${method} ${url.split('?')[0]}`];
    const res: MockResponse = handler
      ? typeof handler === 'function'
        ? await handler({ url, method, body })
        : handler
      : { status: 404, body: { error: { code: 'not_found', message: 'Not found.' } } };
    const status = res.status ?? 200;
    return new Response(status === 204 || res.body === undefined ? null : JSON.stringify(res.body), {
      status,
      headers: { 'Content-Type': 'application/json', ...res.headers },
    });
  });
  vi.stubGlobal('fetch', fetchMock);
  return fetchMock;
}

export function apiError(status: number, code: string, message: string, details?: unknown): MockResponse {
  return { status, body: { error: { code, message, details } } };
}

/** Never answers: keeps a query in its loading state. */
export function pending(): Promise<MockResponse> {
  return new Promise(() => {});
}

export function renderApp(path: string) {
  const queryClient = new QueryClient({
    defaultOptions: { queries: { retry: false, staleTime: Infinity }, mutations: { retry: false } },
  });
  const router = createMemoryRouter(routes, { initialEntries: [path] });
  const utils = render(
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>,
  );
  return { ...utils, router, queryClient };
}

export const designer = {
  user: { id: 'u-dana', email: 'dana@fieldcrew.test', name: 'Dana Whitlock', createdAt: '2025-03-01T10:00:00Z' },
  teams: [{ id: 't-north', name: 'North Shore Off-Grid', role: 'designer', unitSystem: 'metric' }],
  demo: false,
  mailMode: 'outbox',
};

export function meWith(teams: { id: string; name: string; role: string }[], user = designer.user) {
  return { ...designer, user, teams: teams.map((t) => ({ unitSystem: 'metric', ...t })) };
}
