import type { FormItemRule } from 'element-plus';

/**
 * The client's first check of a new password; the API applies its own rule and its message is
 * shown when it refuses.
 */
export const MIN_PASSWORD_LENGTH = 10;

export function newPasswordRules(password: () => string): { password: FormItemRule[]; repeat: FormItemRule[] } {
  return {
    password: [
      { required: true, message: 'Choose a password.', trigger: 'blur' },
      { min: MIN_PASSWORD_LENGTH, message: `Use at least ${MIN_PASSWORD_LENGTH} characters.`, trigger: 'blur' },
    ],
    repeat: [
      { required: true, message: 'Repeat the password.', trigger: 'blur' },
      {
        validator: (_rule, value: string, callback: (error?: Error) => void) =>
          value === password() ? callback() : callback(new Error('The two passwords differ.')),
        trigger: 'blur',
      },
    ],
  };
}
