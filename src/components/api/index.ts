/**
 * Data fetching for islands: @tanstack/react-query behind a few hooks (the page's one
 * QueryClient, `useApi` for a URL, hooks per resource, mutations that invalidate what they
 * change). Single requests and the API's error go through `apiFetch` / `ApiError` in ../ui/api-client.
 */
export { makeQueryClient, useSluiceQueryClient } from './query-client';
export { apiQueryKey, useApi, useApiMutation, useInvalidate, type ApiState } from './use-api';
export * from './resources';
