import { computed, onMounted, watch } from 'vue';
import type { Id } from '@/api/types';
import { useProjectStore } from '@/stores/project';
import { useAsyncData } from './useAsyncData';

/**
 * A list that belongs to the current project (studies, runs, materials, test data): loads after the
 * project list is known and again whenever the user switches project.
 */
export function useProjectList<T>(loader: (projectId: Id) => Promise<T[]>) {
  const projectStore = useProjectStore();
  const project = computed(() => projectStore.current);
  const list = useAsyncData<T[]>(async () => {
    const id = project.value?.id;
    return id === undefined ? [] : loader(id);
  }, []);

  onMounted(async () => {
    await projectStore.ensureLoaded().catch(() => undefined);
    await list.reload();
  });
  watch(() => projectStore.currentId, () => {
    if (projectStore.loaded) void list.reload();
  });

  return { project, projectLoading: computed(() => projectStore.loading && !projectStore.loaded), ...list };
}
