import { computed, ref } from 'vue';
import { defineStore } from 'pinia';
import * as authApi from '@/api/auth';
import { isApiError } from '@/api/http';
import { sameId, type Id, type Membership, type ProjectRole, type User } from '@/api/types';
import { mayDo, type ProjectAction } from '@/utils/roles';
import { closeSharedSocket } from '@/composables/useSocket';

/** Who is signed in, and their role in every project they belong to. */
export const useAuthStore = defineStore('auth', () => {
  const user = ref<User | null>(null);
  const memberships = ref<Membership[]>([]);
  /** False until the first /api/auth/me answer; guards wait for it. */
  const loaded = ref(false);
  let pending: Promise<void> | null = null;

  const isSignedIn = computed(() => user.value !== null);
  const isSiteAdmin = computed(() => user.value?.isAdmin === true);

  function roleIn(projectId: Id | null | undefined): ProjectRole | null {
    return memberships.value.find((m) => sameId(m.projectId, projectId))?.role ?? null;
  }

  function can(action: ProjectAction, projectId: Id | null | undefined): boolean {
    return mayDo(action, roleIn(projectId), isSiteAdmin.value);
  }

  function clear(): void {
    user.value = null;
    memberships.value = [];
    // The live socket was authenticated with the session that just ended; the next sign-in opens a new one.
    closeSharedSocket();
  }

  /** Reloads the session from the server; a 401 simply means "signed out". */
  async function refresh(): Promise<void> {
    try {
      const me = await authApi.getMe();
      user.value = me.user;
      memberships.value = me.memberships ?? [];
    } catch (error) {
      if (!(isApiError(error) && error.code === 'unauthenticated')) throw error;
      clear();
    } finally {
      loaded.value = true;
    }
  }

  /** Loads the session once; later calls reuse the answer (or the request in flight). */
  function ensureLoaded(): Promise<void> {
    if (loaded.value) return Promise.resolve();
    pending ??= refresh().finally(() => { pending = null; });
    return pending;
  }

  async function signIn(email: string, password: string): Promise<void> {
    await authApi.signIn(email, password);
    await refresh();
  }

  async function signOut(): Promise<void> {
    try {
      await authApi.signOut();
    } finally {
      clear();
    }
  }

  return { user, memberships, loaded, isSignedIn, isSiteAdmin, roleIn, can, refresh, ensureLoaded, signIn, signOut, clear };
});
