import { REFERENCE_ELECTRODES } from '../../../../shared/redox/index.ts';

export function referenceLabel(id: string): string {
  return REFERENCE_ELECTRODES.find((r) => r.id === id)?.label ?? id;
}
