import { forgetCsrfToken, http } from './http';
import type { Me, User } from './types';

export function getMe(): Promise<Me> {
  return http.get<Me>('/api/auth/me');
}

export async function signIn(email: string, password: string): Promise<User> {
  const { user } = await http.post<{ user: User }>('/api/auth/login', { email, password });
  // Sign-in regenerates the session, and with it the CSRF token.
  forgetCsrfToken();
  return user;
}

export async function signOut(): Promise<void> {
  try {
    await http.post<void>('/api/auth/logout');
  } finally {
    forgetCsrfToken();
  }
}

export function requestPasswordReset(email: string): Promise<void> {
  return http.post<void>('/api/auth/password-reset/request', { email });
}

export function confirmPasswordReset(token: string, password: string): Promise<void> {
  return http.post<void>('/api/auth/password-reset/confirm', { token, password });
}
