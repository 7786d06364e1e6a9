import type { RouteLocationNormalized, RouteLocationRaw } from 'vue-router';
import { ElMessage } from 'element-plus';
import { useAuthStore } from '@/stores/auth';
import { safeRedirect } from '@/utils/redirect';

/**
 * Decides where a navigation may go. The server checks every request again; this only keeps
 * users away from pages that would answer 401/403.
 */
export async function accessGuard(to: RouteLocationNormalized): Promise<true | RouteLocationRaw> {
  const auth = useAuthStore();
  try {
    await auth.ensureLoaded();
  } catch {
    // The API is unreachable: public pages still work, the others show their own load error.
    if (!to.meta.public) return { name: 'sign-in', query: { redirect: to.fullPath } };
  }

  if (to.meta.guestOnly && auth.isSignedIn) return safeRedirect(to.query.redirect);
  if (to.meta.public) return true;
  if (!auth.isSignedIn) return { name: 'sign-in', query: { redirect: to.fullPath } };
  if (to.meta.siteAdmin && !auth.isSiteAdmin) {
    ElMessage.warning('Only site admins may open that page.');
    return { name: 'projects' };
  }
  return true;
}

export function titleFor(to: RouteLocationNormalized): string {
  return to.meta.title ? `${to.meta.title} · Phaseloop` : 'Phaseloop';
}
