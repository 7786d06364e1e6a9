import { http } from './http';
import type { HealthStatus } from './types';

export function getHealth(): Promise<HealthStatus> {
  return http.get<HealthStatus>('/api/health');
}
