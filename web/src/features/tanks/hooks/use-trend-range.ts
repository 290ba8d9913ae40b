import { useCallback } from 'react';
import { useSearchParams } from 'react-router-dom';
import { PRESETS, type Preset, type TrendRange } from '../api/get-trend';

const DEFAULT: TrendRange = { kind: 'preset', preset: '8h' };

function parse(params: URLSearchParams): TrendRange {
  const from = params.get('from');
  const to = params.get('to');
  if (from && to && Date.parse(from) < Date.parse(to)) return { kind: 'custom', from, to };
  const preset = params.get('range');
  return preset && preset in PRESETS ? { kind: 'preset', preset: preset as Preset } : DEFAULT;
}

/** The trend range lives in the URL, so a view can be shared or reloaded as it is. */
export function useTrendRange(): [TrendRange, (range: TrendRange) => void] {
  const [params, setParams] = useSearchParams();
  const range = parse(params);
  const setRange = useCallback(
    (next: TrendRange) => {
      setParams(next.kind === 'preset' ? { range: next.preset } : { from: next.from, to: next.to }, { replace: true });
    },
    [setParams],
  );
  return [range, setRange];
}
