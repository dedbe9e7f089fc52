import { useMutation, useQueryClient, type QueryClient } from '@tanstack/react-query';
import { z } from 'zod';
import {
  bookingResponseSchema,
  waitlistEntrySchema,
  type CheckOutInput,
  type CreateBookingInput,
  type CreateWaitlistInput,
  type UpdateBookingInput,
} from '@shared/schemas/bookings';
import { api } from '@/lib/api-client';
import { bookingKeys } from './bookings.queries';

const entryResponseSchema = z.object({ entry: waitlistEntrySchema });

/** After any change to a booking: the calendars, my lists and that booking's page (with its audit trail). */
function refreshAfterChange(queryClient: QueryClient, id?: number) {
  return Promise.all([
    queryClient.invalidateQueries({ queryKey: bookingKeys.lists() }),
    queryClient.invalidateQueries({ queryKey: bookingKeys.mine() }),
    // Booking or freeing a slot can fulfil or offer waitlist entries.
    queryClient.invalidateQueries({ queryKey: bookingKeys.waitlist() }),
    id === undefined ? null : queryClient.invalidateQueries({ queryKey: bookingKeys.detail(id) }),
  ]);
}

export function useCreateBooking() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (input: CreateBookingInput) => api('/bookings', { method: 'POST', body: input, schema: bookingResponseSchema }),
    onSuccess: () => refreshAfterChange(queryClient),
  });
}

/** Move (drag, resize) or edit a booking; the server re-checks every rule and may answer 409 or 422. */
export function useUpdateBooking() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, changes }: { id: number; changes: UpdateBookingInput }) =>
      api(`/bookings/${id}`, { method: 'PATCH', body: changes, schema: bookingResponseSchema }),
    onSuccess: ({ booking }) => refreshAfterChange(queryClient, booking.id),
  });
}

export function useCheckIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api(`/bookings/${id}/check-in`, { method: 'POST', schema: bookingResponseSchema }),
    onSuccess: ({ booking }) => refreshAfterChange(queryClient, booking.id),
  });
}

export function useCheckOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, input }: { id: number; input: CheckOutInput }) =>
      api(`/bookings/${id}/check-out`, { method: 'POST', body: input, schema: bookingResponseSchema }),
    onSuccess: ({ booking }) => refreshAfterChange(queryClient, booking.id),
  });
}

export function useCancelBooking() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: ({ id, reason }: { id: number; reason: string }) =>
      api(`/bookings/${id}/cancel`, { method: 'POST', body: { reason }, schema: bookingResponseSchema }),
    onSuccess: ({ booking }) => refreshAfterChange(queryClient, booking.id),
  });
}

/** Join the waitlist for one slot on several instruments at once: one entry per instrument. */
export function useJoinWaitlist() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (entries: CreateWaitlistInput[]) =>
      Promise.all(entries.map(async (entry) => (await api('/waitlist', { method: 'POST', body: entry, schema: entryResponseSchema })).entry)),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: bookingKeys.waitlist() }),
  });
}

export function useLeaveWaitlist() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api<void>(`/waitlist/${id}`, { method: 'DELETE' }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: bookingKeys.waitlist() }),
  });
}

/**
 * Book the freed slot of an offered waitlist entry (the link of the offer's e-mail): exactly the offered range. The
 * server books it through the normal booking rules and marks the entry fulfilled; 409 when the slot was taken again
 * (the entry is then waiting again) or the offer is closed.
 */
export function useClaimWaitlistOffer() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: (entryId: number) => api(`/waitlist/${entryId}/claim`, { method: 'POST', schema: bookingResponseSchema }),
    onSuccess: ({ booking }) => refreshAfterChange(queryClient, booking.id),
    // A claim refused by a clash or a rule puts the entry back to waiting.
    onError: () => queryClient.invalidateQueries({ queryKey: bookingKeys.waitlist() }),
  });
}
