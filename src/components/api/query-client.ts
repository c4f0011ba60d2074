import { QueryClient, QueryClientContext } from '@tanstack/react-query';
import { useContext, useState } from 'react';

/**
 * Our settings for every QueryClient: no automatic retries (the server's refusal is the answer
 * to show) and no refetch when the window regains focus (a form being filled must not redraw).
 */
export function makeQueryClient(): QueryClient {
  return new QueryClient({ defaultOptions: { queries: { retry: false, refetchOnWindowFocus: false }, mutations: { retry: false } } });
}

let browserClient: QueryClient | undefined;

/**
 * The page's one QueryClient in the browser, so islands on one page share a cache and a write in
 * one refreshes what another shows; a throwaway one while an island renders on the server (it
 * fetches nothing there, and nothing may outlive the request).
 */
function pageQueryClient(): QueryClient {
  if (typeof window === 'undefined') return makeQueryClient();
  return (browserClient ??= makeQueryClient());
}

/** The QueryClient of the nearest provider, else the page's. Every island root gets one without wrapping. */
export function useSluiceQueryClient(): QueryClient {
  const provided = useContext(QueryClientContext);
  const [page] = useState(pageQueryClient);
  return provided ?? page;
}
