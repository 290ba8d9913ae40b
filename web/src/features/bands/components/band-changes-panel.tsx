import type { SessionUser } from '@shared/schemas/auth';
import type { BandChangesQuery } from '@shared/schemas/bands';
import { Panel } from '../../../components/ui/panel';
import { ErrorState, Loading } from '../../../components/ui/page-state';
import { useBandChanges } from '../api/get-band-changes';
import { BandChangeItem } from './band-change-item';

type Props = { title: string; filter: Partial<BandChangesQuery>; user: SessionUser; timeZone: string; empty: string; onChanged?: () => void };

/** A list of band changes: the pending ones to decide, or a tank's history (append-only). */
export function BandChangesPanel({ title, filter, user, timeZone, empty, onChanged }: Props) {
  const changes = useBandChanges(filter);
  return (
    <Panel title={title}>
      {changes.isPending ? (
        <Loading label="Loading changes…" />
      ) : changes.isError ? (
        <ErrorState title="Changes could not be loaded" detail={changes.error.message} onRetry={() => changes.refetch()} />
      ) : changes.data.length === 0 ? (
        <p className="text-ink-muted">{empty}</p>
      ) : (
        <ul>
          {changes.data.map((c) => (
            <BandChangeItem key={c.id} change={c} user={user} timeZone={timeZone} onChanged={onChanged} />
          ))}
        </ul>
      )}
    </Panel>
  );
}
