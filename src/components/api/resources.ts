import type { BinPlanList } from '~/contracts/bin-plans';
import type { BinStockPage } from '~/contracts/bins';
import type { MatchableTypeList } from '~/contracts/match';
import type { PartDetailJson, PartsPage } from '~/contracts/parts';
import type { PickListList, PickListQuery, PickListView } from '~/contracts/pick-lists';
import type { ReservationList, ReservationView } from '~/contracts/reservations';
import type { StatisticsOptions, StatisticsReport } from '~/contracts/statistics';
import { useApi } from './use-api';

/** Query hooks per resource: the URL and the contract of its answer in one place. */

export const useParts = (query: string) => useApi<PartsPage>(`/api/parts?${query}`);
export const usePart = (serial: string) => useApi<PartDetailJson>(`/api/parts/${encodeURIComponent(serial)}`);
export const useBinPlans = () => useApi<BinPlanList>('/api/bin-plans');
export const useBinStock = (query: string) => useApi<BinStockPage>(`/api/bins?${query}`);
export const useMatchableTypes = () => useApi<MatchableTypeList>('/api/match/device-types');
export const useStatisticsOptions = () => useApi<StatisticsOptions>('/api/statistics/options');
export const useStatistics = (query: string) => useApi<StatisticsReport>(`/api/statistics${query ? `?${query}` : ''}`);
export const useReservations = () => useApi<ReservationList>('/api/reservations');
export const useReservation = (id: string) => useApi<ReservationView>(`/api/reservations/${encodeURIComponent(id)}`);
export const usePickLists = (status: PickListQuery['status']) => useApi<PickListList>(`/api/pick-lists?status=${status}`);
export const usePickList = (id: string) => useApi<PickListView>(`/api/pick-lists/${encodeURIComponent(id)}`);
