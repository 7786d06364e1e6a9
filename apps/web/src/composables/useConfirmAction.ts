import { ElMessage, ElMessageBox } from 'element-plus';
import { asApiError } from './useAsyncData';

interface ConfirmOptions {
  title: string;
  message: string;
  confirmText: string;
  /** Shown as a short notice after success. */
  done: string;
  danger?: boolean;
}

/**
 * Asks before a destructive or far-reaching action, runs it, and reports the outcome in words.
 * Resolves true when the action ran and succeeded.
 */
export async function confirmAndRun(options: ConfirmOptions, action: () => Promise<unknown>): Promise<boolean> {
  try {
    await ElMessageBox.confirm(options.message, options.title, {
      confirmButtonText: options.confirmText,
      cancelButtonText: 'Cancel',
      type: options.danger ? 'warning' : 'info',
      confirmButtonClass: options.danger ? 'el-button--danger' : undefined,
    });
  } catch {
    return false;
  }
  return runWithNotice(options.done, action);
}

/** Runs an action and tells the user whether it worked, with the server's own message if not. */
export async function runWithNotice(done: string, action: () => Promise<unknown>): Promise<boolean> {
  try {
    await action();
    ElMessage.success(done);
    return true;
  } catch (error) {
    ElMessage.error(asApiError(error).message);
    return false;
  }
}
