import { api } from '../../../lib/api-client';
import { useAlarmMutation } from './alarm-mutation';

/** Acknowledges every alarm of one tank that waits for it (one history entry each). */
export const acknowledgeTank = ({ tankId, comment }: { tankId: number; comment?: string }) =>
  api.post<{ acknowledged: number[] }>(`/api/alarms/tanks/${tankId}/acknowledge`, { comment });

export const useAcknowledgeTank = () => useAlarmMutation(acknowledgeTank);
