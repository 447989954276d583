import type { FormState } from "@/lib/actions";

/**
 * A key for a form that must show what the person typed after a refused submit. React resets a form after its action
 * runs, and a <select> resets to the option it was first rendered with, not to a later `defaultValue`: re-creating
 * the form with the submitted values as defaults keeps every field as it was sent.
 */
export function formKey(state: FormState): string {
  return state.values ? JSON.stringify(state.values) : "initial";
}

export type { FormState };
