import { ref } from 'vue';
import type { z } from 'zod';
import { checkForm, placeApiError, type FieldErrors } from '../utils/fieldErrors.ts';

/**
 * A form's errors and busy state. `submit` checks the input with the shared zod schema first (each
 * message beside its field, prefixed with the field's label), then sends it; an API error goes
 * beside the field the server named, else above the buttons. `run` is the sending half alone.
 */
export function useForm(labels: Record<string, string>) {
  const errors = ref<FieldErrors>({});
  const failure = ref('');
  const busy = ref(false);

  async function run(send: () => Promise<unknown>): Promise<boolean> {
    failure.value = '';
    busy.value = true;
    try {
      await send();
      return true;
    } catch (e) {
      const placed = placeApiError(e, Object.keys(labels));
      errors.value = placed.fields;
      failure.value = placed.form ?? '';
      return false;
    } finally {
      busy.value = false;
    }
  }

  async function submit<S extends z.ZodType>(schema: S, input: unknown, send: (value: z.output<S>) => Promise<unknown>): Promise<boolean> {
    failure.value = '';
    const checked = checkForm(schema, input);
    if (!checked.ok) {
      errors.value = Object.fromEntries(Object.entries(checked.errors).map(([k, v]) => [k, `${labels[k] ?? k} ${v}`]));
      return false;
    }
    errors.value = {};
    return run(() => send(checked.value));
  }

  function reset(): void {
    errors.value = {};
    failure.value = '';
  }

  return { errors, failure, busy, run, submit, reset };
}
