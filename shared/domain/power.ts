/** dBm from watts: 10·log10(P / 1 mW) (Wikipedia, "DBm"). */
export function wattsToDbm(watts: number): number {
  return 10 * Math.log10(watts * 1000);
}

/** Watts from dBm: 10^(dBm/10) mW. */
export function dbmToWatts(dbm: number): number {
  return 10 ** (dbm / 10) / 1000;
}
