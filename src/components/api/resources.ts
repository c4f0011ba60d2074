import type { BinPlanList } from '~/contracts/bin-plans';
import type { BinMapJson, BinPartsPage, BinStockPage } from '~/contracts/bins';
import type { DeviceTypeList } from '~/contracts/device-types';
import type { LocationList } from '~/contracts/locations';
import type { LotList } from '~/contracts/lots';
import type { MatchableTypeList } from '~/contracts/match';
import type { PartDetailJson, PartsPage } from '~/contracts/parts';
import type { PickListList, PickListQuery, PickListView } from '~/contracts/pick-lists';
import type { ReservationList, ReservationView } from '~/contracts/reservations';
import type { ReviewQueue, ReviewQueueQuery } from '~/contracts/review';
import type { StationList } from '~/contracts/stations';
import type { StatisticsOptions, StatisticsReport } from '~/contracts/statistics';
import type { AwaitingLotList } from '~/contracts/stock';
import type { UserList } from '~/contracts/users';
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
export const useLocations = (enabled = true) => useApi<LocationList>(enabled ? '/api/locations' : null);
export const useLots = () => useApi<LotList>('/api/lots');
export const useReviewQueue = (status: ReviewQueueQuery['status']) => useApi<ReviewQueue>(`/api/review?status=${status}`);
export const useAwaitingReceipt = () => useApi<AwaitingLotList>('/api/stock/awaiting');
export const useUsers = () => useApi<UserList>('/api/admin/users');
export const useStations = () => useApi<StationList>('/api/admin/stations');
export const useBinParts = (binId: number, query: string) => useApi<BinPartsPage>(`/api/bins/${binId}/parts?${query}`);
export const useDeviceTypes = () => useApi<DeviceTypeList>('/api/admin/device-types');
/** No request while no type is chosen. */
export const useBinMap = (deviceType: string | null | undefined) => useApi<BinMapJson>(deviceType ? `/api/bins/map?device_type=${encodeURIComponent(deviceType)}` : null);
