import { shallowRef, ref, type Ref, type ShallowRef } from 'vue';
import { isApiError, ApiError } from '@/api/http';

export interface AsyncData<T> {
  data: ShallowRef<T>;
  loading: Ref<boolean>;
  error: ShallowRef<ApiError | null>;
  reload: () => Promise<void>;
}

/** Any thrown value as an ApiError, so templates show one kind of message. */
export function asApiError(error: unknown): ApiError {
  if (isApiError(error)) return error;
  const message = error instanceof Error ? error.message : 'Something went wrong.';
  return new ApiError(0, 'unexpected_response', message);
}

/**
 * Loads data from the API and keeps loading/error state beside it. Answers that arrive after a
 * newer request started are dropped, so a fast project switch never shows the old project's rows.
 */
export function useAsyncData<T>(loader: () => Promise<T>, initial: T): AsyncData<T> {
  const data = shallowRef(initial) as ShallowRef<T>;
  const loading = ref(false);
  const error = shallowRef<ApiError | null>(null);
  let generation = 0;

  async function reload(): Promise<void> {
    const mine = ++generation;
    loading.value = true;
    error.value = null;
    try {
      const value = await loader();
      if (mine === generation) data.value = value;
    } catch (caught) {
      if (mine === generation) {
        data.value = initial;
        error.value = asApiError(caught);
      }
    } finally {
      if (mine === generation) loading.value = false;
    }
  }

  return { data, loading, error, reload };
}
