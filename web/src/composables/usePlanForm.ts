import { computed, reactive, ref, shallowRef, watch, type InjectionKey } from 'vue';
import { stringify } from 'yaml';
import { getFamily, FAMILIES } from '../../../shared/physics/potential/families.ts';
import { createPointSource, planPointCount } from '../../../shared/plan/expandPlan.ts';
import { PlanValidationError, type PlanIssue } from '../../../shared/plan/planError.ts';
import type { PointRequest } from '../../../shared/plan/pointRequest.ts';
import { scanPlanSchema, type ScanPlan } from '../../../shared/plan/scanPlan.ts';
import { validatePlan } from '../../../shared/plan/validatePlan.ts';
import { formFields, messagesAt, relocateIssues, unclaimedIssues, type FieldRef } from '../components/plan/fieldIssues.ts';
import { declaredParameters, emptyForm, formToPlan, type PlanForm } from '../components/plan/planForm.ts';

/** Validation waits this long after the last keystroke (an expression is compiled to check it). */
export const VALIDATION_DELAY_MS = 200;

export interface Validation {
  issues: PlanIssue[];
  plan: ScanPlan | null;
  /** The point count when the axes themselves are valid, even if other fields are not. */
  pointCount: number | null;
}

function issuesOf(err: unknown): PlanIssue[] {
  if (err instanceof PlanValidationError) return [...err.issues];
  return [{ path: '', message: (err as Error).message }];
}

/** Checks the form's plan with the same code as the server (validatePlan), every problem at once. */
export function validateForm(form: PlanForm): Validation {
  const { plan: data, issues: formIssues } = formToPlan(form);
  let plan: ScanPlan | null = null;
  let issues = formIssues;
  try {
    plan = validatePlan(data);
  } catch (err) {
    issues = [...formIssues, ...issuesOf(err)];
  }
  if (formIssues.length > 0) plan = null;
  const axes = scanPlanSchema.shape.axes.safeParse(data.axes);
  const pointCount = plan ? planPointCount(plan) : axes.success ? planPointCount({ axes: axes.data, combine: form.combine }) : null;
  return { issues, plan, pointCount };
}

/**
 * The point the preview computes: point `index` of the plan, built by the same expansion as the
 * scan's. Title, notes and bound set do not change a point, so their problems do not block it.
 */
export function previewRequest(form: PlanForm, index: number): { request: PointRequest; values: Record<string, number>; count: number } | { issues: PlanIssue[] } {
  const { plan } = formToPlan({ ...form, title: 'preview', notes: '', boundSet: '' });
  try {
    const source = createPointSource(validatePlan(plan));
    const at = Math.min(Math.max(0, Math.floor(index)), source.count - 1);
    return { request: source.requestAt(at), values: source.valuesAt(at), count: source.count };
  } catch (err) {
    return { issues: issuesOf(err) };
  }
}

/** Names of the potential's parameters as the form shows them (V0 first for families). */
export function parameterNames(form: PlanForm): string[] {
  if (form.potentialKind === 'family') {
    return FAMILIES.some((f) => f.id === form.family) ? getFamily(form.family).parameters.map((p) => p.name) : [];
  }
  if (form.potentialKind === 'table') return ['V0'];
  const declared = declaredParameters(form);
  return declared.includes('V0') ? declared : ['V0', ...declared];
}

/** Reactive form state with debounced validation; shared with the plan components by provide/inject. */
export function usePlanForm(initial: PlanForm = emptyForm()) {
  const form = reactive(initial) as PlanForm;
  const validation = shallowRef<Validation>(validateForm(form));
  /** Problems the server reported on the last submit, until the form changes. */
  const serverIssues = ref<PlanIssue[]>([]);
  /** Messages wait for the first change (or a submit): a fresh form is not yet wrong. */
  const touched = ref(false);
  let timer: ReturnType<typeof setTimeout> | undefined;

  watch(form, () => {
    touched.value = true;
    serverIssues.value = [];
    clearTimeout(timer);
    timer = setTimeout(() => { validation.value = validateForm(form); }, VALIDATION_DELAY_MS);
  }, { deep: true });

  const issues = computed(() => relocateIssues([...validation.value.issues, ...serverIssues.value], declaredParameters(form)));
  const shown = computed(() => (touched.value ? issues.value : []));
  const names = computed(() => parameterNames(form));
  const unclaimed = computed(() => unclaimedIssues(shown.value, formFields(form, names.value)));
  const yaml = computed(() => stringify(formToPlan(form).plan));

  return {
    form,
    validation,
    serverIssues,
    issues,
    unclaimed,
    parameterNames: names,
    yaml,
    messages: (field: FieldRef) => messagesAt(shown.value, field),
    /** Validates now (before a submit), without waiting for the debounce. */
    validateNow: () => {
      touched.value = true;
      clearTimeout(timer);
      validation.value = validateForm(form);
      return validation.value;
    },
    replace: (next: PlanForm) => Object.assign(form, next),
  };
}

export type PlanFormContext = ReturnType<typeof usePlanForm>;
export const planFormKey: InjectionKey<PlanFormContext> = Symbol('plan form');
