import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { GatewaySecret } from '@shared/schemas/plant-setup';
import { api } from '../../../lib/api-client';
import { plantSetupKeys } from './plant-setup-keys';

export const rotateGatewayPassword = (id: number, reason: string) =>
  api.post<GatewaySecret>(`/api/plant-setup/gateways/${id}/rotate`, { reason });

export function useRotateGatewayPassword(id: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (reason: string) => rotateGatewayPassword(id, reason),
    onSuccess: () => qc.invalidateQueries({ queryKey: plantSetupKeys.parts() }),
  });
}
