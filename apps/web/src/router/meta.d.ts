import 'vue-router';
import type { ProjectRole } from '@/api/types';

export {};

declare module 'vue-router' {
  interface RouteMeta {
    /** Shown in the browser tab after "Phaseloop · ". */
    title?: string;
    /** Reachable without signing in (sign-in, password reset, invitations, not found). */
    public?: boolean;
    /** Signed-in users are sent on to the app (the sign-in and forgot-password pages). */
    guestOnly?: boolean;
    /** Only site admins (`isAdmin`) may open it; the API enforces the same on /api/admin/*. */
    siteAdmin?: boolean;
    /** Lowest project role that finds the page useful; used to hide links, never to grant rights. */
    minimumRole?: ProjectRole;
    /** Pages about one project's data; they follow the project switcher. */
    perProject?: boolean;
    /** Drawn without the app frame (header, navigation, footer): pages meant for printing. */
    bare?: boolean;
  }
}
