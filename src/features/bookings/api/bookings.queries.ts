import { queryOptions } from '@tanstack/react-query';
import { bookingDetailSchema, bookingListSchema, myBookingsSchema, waitlistListSchema } from '@shared/schemas/bookings';
import { api } from '@/lib/api-client';

/** The calendar's visible range (ISO instants) and the instruments it shows; no ids means every instrument. */
export interface BookingListFilters {
  from: string;
  to: string;
  instrumentIds?: number[];
}

export const bookingKeys = {
  all: ['bookings'] as const,
  lists: () => [...bookingKeys.all, 'list'] as const,
  list: (filters: BookingListFilters) => [...bookingKeys.lists(), filters] as const,
  details: () => [...bookingKeys.all, 'detail'] as const,
  detail: (id: number) => [...bookingKeys.details(), id] as const,
  mine: () => [...bookingKeys.all, 'mine'] as const,
  waitlist: () => [...bookingKeys.all, 'waitlist', 'mine'] as const,
};

async function getBookings({ from, to, instrumentIds }: BookingListFilters) {
  const params = new URLSearchParams({ from, to });
  if (instrumentIds?.length) params.set('instrumentId', instrumentIds.join(','));
  return (await api(`/bookings?${params}`, { schema: bookingListSchema })).bookings;
}

export const bookingListOptions = (filters: BookingListFilters) =>
  queryOptions({ queryKey: bookingKeys.list(filters), queryFn: () => getBookings(filters) });

/** One booking with its audit trail. */
export const bookingDetailOptions = (id: number) =>
  queryOptions({ queryKey: bookingKeys.detail(id), queryFn: () => api(`/bookings/${id}`, { schema: bookingDetailSchema }) });

export const myBookingsOptions = () => queryOptions({ queryKey: bookingKeys.mine(), queryFn: () => api('/bookings/mine', { schema: myBookingsSchema }) });

export const myWaitlistOptions = () =>
  queryOptions({ queryKey: bookingKeys.waitlist(), queryFn: async () => (await api('/waitlist/mine', { schema: waitlistListSchema })).entries });
