import { useSearchParams } from 'react-router-dom';
import type { DigestParams } from '../api/get-digest';

/** The digest asked for lives in the address (?shift=… or ?from=…&to=…), so it can be shared and printed again. */
export function useDigestParams(): [DigestParams, (next: DigestParams) => void] {
  const [search, setSearch] = useSearchParams();
  const params: DigestParams = {
    shiftStart: search.get('shift') ?? undefined,
    from: search.get('from') ?? undefined,
    to: search.get('to') ?? undefined,
  };
  const set = (next: DigestParams) => {
    const s = new URLSearchParams();
    if (next.shiftStart) s.set('shift', next.shiftStart);
    if (next.from && next.to) {
      s.set('from', next.from);
      s.set('to', next.to);
    }
    setSearch(s);
  };
  return [params, set];
}
