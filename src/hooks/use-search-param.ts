import { useSearchParams } from 'react-router-dom';

/**
 * Filters kept in the URL: read a search param (only from `allowed` when given) and set or clear it,
 * replacing the history entry so typing in a filter does not flood the back button.
 */
export function useSearchParam<T extends string = string>(key: string, allowed?: readonly T[]): [T | undefined, (value: string) => void] {
  const [params, setParams] = useSearchParams();
  const raw = params.get(key) ?? '';
  const value = raw && (!allowed || (allowed as readonly string[]).includes(raw)) ? (raw as T) : undefined;
  const set = (next: string) =>
    setParams(
      (prev) => {
        const updated = new URLSearchParams(prev);
        if (next) updated.set(key, next);
        else updated.delete(key);
        return updated;
      },
      { replace: true },
    );
  return [value, set];
}
