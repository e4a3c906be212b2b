import { reactive } from 'vue';

/** The state PrimeVue Forms keeps for one field (the part we read). */
export interface FieldState {
  invalid?: boolean;
  error?: { message?: string } | null;
}

/**
 * Messages the server sent for fields (validation_failed, email_taken …), shown under the
 * fields until the person edits them.
 */
export function useServerFieldErrors() {
  const errors = reactive<Record<string, string | undefined>>({});

  function clear(name?: string): void {
    if (name) {
      errors[name] = undefined;
      return;
    }
    for (const key of Object.keys(errors)) errors[key] = undefined;
  }

  function set(fields: Record<string, string>): void {
    clear();
    Object.assign(errors, fields);
  }

  return { errors, set, clear };
}

/** The message under a field: the browser-side rule first, then the server's answer. */
export function fieldMessage(state: FieldState | undefined, server?: string): string | undefined {
  if (state?.invalid) return state.error?.message ?? 'Check this field.';
  return server;
}

/** `invalid` for a PrimeVue input: true, or undefined so the form's own state decides. */
export function invalidIf(condition: unknown): true | undefined {
  return condition ? true : undefined;
}
