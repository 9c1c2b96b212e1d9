import { computed, reactive, ref } from 'vue';
import type { z } from 'zod';
import type { FieldIssue } from '@shared/schemas/common';
import { ApiError } from '@/api/http';

/**
 * Field errors of one form, from two places that name fields the same way (dotted paths such
 * as `cure.refTempC`): the shared zod schema the route also uses (checked before sending) and
 * a 400 answer's `details` (checked by the server). Each message is shown at its field; what
 * names no known field is shown once for the whole form.
 */

/** A zod issue path as the API names fields: ['cure', 'refTempC'] → 'cure.refTempC'. */
export function pathToField(path: readonly PropertyKey[]): string {
  return path.map(String).join('.');
}

/**
 * The form field a message belongs to: the field itself when the form has it, else the
 * longest known field it lies inside (`hazards.statements.2` → `hazards.statements`), else null.
 * With no list of known fields, every field is taken as it is.
 */
export function fieldFor(field: string, known?: readonly string[]): string | null {
  if (!known) return field;
  let candidate = field;
  for (;;) {
    if (known.includes(candidate)) return candidate;
    const cut = candidate.lastIndexOf('.');
    if (cut < 0) return null;
    candidate = candidate.slice(0, cut);
  }
}

export interface SortedIssues {
  /** The first message for each known field. */
  fields: Record<string, string>;
  /** Messages that name no known field, prefixed with what they name. */
  general: string[];
}

/** Sorts field issues onto the known fields; the first message per field wins. */
export function sortIssues(issues: readonly FieldIssue[], known?: readonly string[]): SortedIssues {
  const fields: Record<string, string> = {};
  const general: string[] = [];
  for (const issue of issues) {
    const field = issue.field ? fieldFor(issue.field, known) : null;
    if (field) {
      if (!(field in fields)) fields[field] = issue.message;
    } else {
      general.push(issue.field ? `${issue.field} ${issue.message}` : issue.message);
    }
  }
  return { fields, general };
}

/** zod issues in the API's `details` shape. */
export function zodToIssues(error: z.ZodError): FieldIssue[] {
  return error.issues.map((issue) => ({ field: pathToField(issue.path), message: issue.message }));
}

/**
 * `known`: the form's fields (others go to the form message). `labels`: what each field is
 * called on screen, so each message names its field ("Shelf life must be more than 0").
 */
export function useFieldErrors(known?: readonly string[], labels: Readonly<Record<string, string>> = {}) {
  const errors = reactive<Record<string, string>>({});

  function named(fields: Record<string, string>): Record<string, string> {
    return Object.fromEntries(Object.entries(fields).map(([f, m]) => [f, labels[f] ? `${labels[f]} ${m}` : m]));
  }
  /** A message for the whole form (a refusal that names no field, an unreachable server). */
  const formError = ref('');

  function clear(field?: string): void {
    if (field === undefined) {
      for (const key of Object.keys(errors)) delete errors[key];
      formError.value = '';
    } else {
      delete errors[field];
    }
  }

  function show(issues: readonly FieldIssue[]): void {
    const sorted = sortIssues(issues, known);
    Object.assign(errors, named(sorted.fields));
    if (sorted.general.length > 0) formError.value = sorted.general.join(' ');
  }

  /**
   * Parses `value` with the shared schema: the parsed data when valid, else null with every
   * problem shown at its field.
   */
  function validate<S extends z.ZodTypeAny>(schema: S, value: unknown): z.output<S> | null {
    clear();
    const result = schema.safeParse(value);
    if (result.success) return result.data as z.output<S>;
    show(zodToIssues(result.error));
    return null;
  }

  /**
   * Shows a failed request: a 400's details at their fields (the rest, and every other
   * refusal, as the form's message). Returns true when it was an ApiError (shown), false
   * otherwise (the caller decides).
   */
  function fromApiError(err: unknown): boolean {
    if (!(err instanceof ApiError)) return false;
    if (err.details.length > 0) {
      const sorted = sortIssues(err.details, known);
      Object.assign(errors, named(sorted.fields));
      if (sorted.general.length > 0 || Object.keys(sorted.fields).length === 0) formError.value = err.text;
    } else {
      formError.value = err.text;
    }
    return true;
  }

  /** Props for a Quasar field: `v-bind="fieldProps('name')"`. */
  function fieldProps(field: string) {
    return { error: field in errors, errorMessage: errors[field] };
  }

  const hasErrors = computed(() => Object.keys(errors).length > 0 || formError.value !== '');

  return { errors, formError, hasErrors, clear, show, validate, fromApiError, fieldProps };
}
