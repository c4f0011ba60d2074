import { keepPreviousData, useMutation, useQuery, type QueryKey } from '@tanstack/react-query';
import { useCallback } from 'react';
import { apiFetch } from '../ui/api-client';
import { useSluiceQueryClient } from './query-client';

/**
 * The query key of an API URL: its path segments, then its query string, so that invalidating
 * `['api', 'bins']` refreshes every query under /api/bins whatever its filters.
 */
export function apiQueryKey(url: string): QueryKey {
  const [path, search = ''] = url.split('?');
  return [...path.split('/').filter(Boolean), search];
}

export interface ApiState<T> {
  data: T | undefined;
  error: Error | undefined;
  /** True while a request for this URL is on its way (the first load or a refresh). */
  loading: boolean;
  reload: () => void;
}

/**
 * Loads `url` (nothing while it is null) through the page's QueryClient; the previous answer
 * stays shown while a changed URL loads, and `reload()` fetches again.
 */
export function useApi<T>(url: string | null): ApiState<T> {
  const client = useSluiceQueryClient();
  const q = useQuery(
    {
      queryKey: url === null ? ['none'] : apiQueryKey(url),
      queryFn: () => apiFetch<T>(url!),
      enabled: url !== null,
      placeholderData: keepPreviousData,
    },
    client,
  );
  const { refetch } = q;
  const reload = useCallback(() => void refetch(), [refetch]);
  return { data: q.data, error: q.error ?? undefined, loading: url !== null && q.isFetching, reload };
}

/** Refreshes every query under the given API resources (`invalidate('bins', 'bin-plans')`). */
export function useInvalidate(): (...resources: string[]) => Promise<void> {
  const client = useSluiceQueryClient();
  return useCallback(
    async (...resources: string[]) => {
      await Promise.all(resources.map((r) => client.invalidateQueries({ queryKey: ['api', ...r.split('/')] })));
    },
    [client],
  );
}

/**
 * A write to the API that, once it succeeds, refreshes every query under `invalidates`
 * (resource paths below /api/, e.g. 'bins').
 */
export function useApiMutation<TVars, TOut>(send: (vars: TVars) => Promise<TOut>, invalidates: string[]) {
  const client = useSluiceQueryClient();
  const invalidate = useInvalidate();
  return useMutation({ mutationFn: send, onSuccess: () => invalidate(...invalidates) }, client);
}
