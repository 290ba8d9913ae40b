import type { PartKind } from '../api/plant-setup-keys';
import { useRetirePart } from '../api/retire-part';
import { ReasonAction } from './reason-action';

/** Retiring keeps the part and its readings; it leaves the Floor and stops taking readings. */
export function RetireButton({ kind, id, label }: { kind: PartKind; id: number; label: string }) {
  const retire = useRetirePart(kind, id);
  return (
    <ReasonAction
      label="Retire"
      prompt={`Why is ${label} retired?`}
      confirm="Retire"
      danger
      pending={retire.isPending}
      error={retire.error}
      onConfirm={(reason, done) => retire.mutate(reason, { onSuccess: done })}
    />
  );
}
