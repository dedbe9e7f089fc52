/** SQL of a timestamptz column as the API writes instants: ISO 8601 in UTC with milliseconds, `2026-12-01T09:30:00.000Z`. */
export const isoUtcSql = (column: string) => `to_char(${column} AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"')`;
