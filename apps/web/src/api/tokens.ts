/** Personal API tokens of the signed-in user (for scripts: `Authorization: Bearer plt_…`). */
import type { ApiTokenDto, CreatedApiTokenDto } from '@phaseloop/shared';
import { http, seg } from './http';

export type ApiToken = ApiTokenDto;
export type CreatedApiToken = CreatedApiTokenDto;

export function listTokens(): Promise<ApiToken[]> {
  return http.get<ApiToken[]>('/api/tokens');
}

/** The answer holds the secret; the API never shows it again. */
export function createToken(name: string): Promise<CreatedApiToken> {
  return http.post<CreatedApiToken>('/api/tokens', { name });
}

export function revokeToken(id: string): Promise<void> {
  return http.delete(`/api/tokens/${seg(id)}`);
}
