import { computed, ref, watch } from 'vue';
import { defineStore } from 'pinia';
import { listProjects } from '@/api/projects';
import { sameId, type Id, type Project } from '@/api/types';
import { useAuthStore } from './auth';

const STORAGE_KEY = 'phaseloop.currentProject';

function readStoredId(): string | null {
  try {
    return localStorage.getItem(STORAGE_KEY);
  } catch {
    return null;
  }
}

function storeId(id: Id | null): void {
  try {
    if (id === null) localStorage.removeItem(STORAGE_KEY);
    else localStorage.setItem(STORAGE_KEY, String(id));
  } catch {
    // Private windows may refuse storage; the choice then lasts for this tab only.
  }
}

/** The projects the user can open and the one the per-project pages show. */
export const useProjectStore = defineStore('project', () => {
  const auth = useAuthStore();
  const projects = ref<Project[]>([]);
  const loaded = ref(false);
  const loading = ref(false);
  const currentId = ref<string | null>(readStoredId());

  const current = computed(() => projects.value.find((p) => sameId(p.id, currentId.value)) ?? null);
  /** The user's own role in the current project (null for a site admin who is not a member). */
  const currentRole = computed(() => current.value?.role ?? auth.roleIn(current.value?.id));

  function select(id: Id | null): void {
    currentId.value = id === null ? null : String(id);
    storeId(id);
  }

  /** Keeps the stored choice if it still exists, else falls back to the first project. */
  function settleCurrent(): void {
    if (current.value) return;
    select(projects.value[0]?.id ?? null);
  }

  async function load(): Promise<void> {
    loading.value = true;
    try {
      projects.value = await listProjects();
      loaded.value = true;
      settleCurrent();
    } finally {
      loading.value = false;
    }
  }

  function ensureLoaded(): Promise<void> {
    return loaded.value ? Promise.resolve() : load();
  }

  function reset(): void {
    projects.value = [];
    loaded.value = false;
  }

  // A different user may sign in in the same tab: never show the previous user's list.
  watch(() => auth.user?.id, (now, before) => {
    if (now !== before) reset();
  });

  return { projects, loaded, loading, currentId, current, currentRole, select, load, ensureLoaded, reset };
});
