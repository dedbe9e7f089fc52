// The SQL that turns bookings into the API's JSON. PostgreSQL builds the JSON itself, so the calendar's
// range read never materialises model instances in Node (see the README's performance section).
import { MAX_BOOKING_DAYS } from '../../../shared/schemas/bookings.js';

const iso = (column: string) => `to_char(${column} AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"')`;

/**
 * One booking as JSON, for alias `bk`. Parameters: :viewerId, :isManager, :seesDetails (false for visitors,
 * who see instrument and time only).
 */
export const bookingJson = `json_build_object(
  'id', bk.id,
  'kind', bk.kind,
  'status', bk.status,
  'startsAt', ${iso('bk.starts_at')},
  'endsAt', ${iso('bk.ends_at')},
  'instruments', (
    SELECT json_agg(json_build_object('id', i.id, 'tag', i.tag, 'name', i.name, 'kind', i.kind) ORDER BY i.tag)
      FROM booking_instruments bi2 JOIN instruments i ON i.id = bi2.instrument_id
     WHERE bi2.booking_id = bk.id),
  'owner', CASE WHEN :seesDetails THEN (SELECT json_build_object('id', u.id, 'name', u.name) FROM users u WHERE u.id = bk.owner_id) END,
  'purpose', CASE WHEN :seesDetails THEN bk.purpose END,
  'projectCode', CASE WHEN :seesDetails THEN bk.project_code END,
  'notes', CASE WHEN :seesDetails THEN bk.notes END,
  'handoverNote', CASE WHEN :seesDetails THEN bk.handover_note END,
  'leftConnected', CASE WHEN :seesDetails THEN bk.left_connected END,
  'cancelReason', CASE WHEN :seesDetails THEN bk.cancel_reason END,
  'calibrationOverride', bk.calibration_override_by IS NOT NULL,
  'checkedInAt', ${iso('bk.checked_in_at')},
  'checkedOutAt', ${iso('bk.checked_out_at')},
  'cancelledAt', ${iso('bk.cancelled_at')},
  'canChange', (bk.owner_id = :viewerId OR :isManager) AND bk.status IN ('confirmed', 'checked-in') AND :seesDetails,
  'createdAt', ${iso('bk.created_at')}
)`;

/**
 * Bookings of the calendar range [from, to), optionally of some instruments, as a JSON array text.
 * The index on booking_instruments (instrument_id, starts_at) serves it: starts_at is bounded on both sides,
 * from below by `from` minus the longest possible booking.
 */
export function rangeQuery(withInstruments: boolean): string {
  return `
    SELECT coalesce(json_agg(${bookingJson} ORDER BY bk.starts_at, bk.id), '[]')::text AS json
      FROM bookings bk
     WHERE bk.status NOT IN ('cancelled', 'no-show')
       AND bk.id IN (
         SELECT bi.booking_id FROM booking_instruments bi
          WHERE bi.starts_at < :to
            AND bi.starts_at > (:from)::timestamptz - interval '${MAX_BOOKING_DAYS} days'
            AND bi.ends_at > :from
            ${withInstruments ? 'AND bi.instrument_id IN (:instrumentIds)' : ''})`;
}
