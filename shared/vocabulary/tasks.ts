export const TASKS = [
  'reproduction',
  'bisection',
  'verbal_estimation',
  'two_interval_comparison',
  'temporal_order_judgement',
  'simultaneity_judgement',
  'other',
] as const;
export type Task = (typeof TASKS)[number];

export const TASK_LABELS: Record<Task, string> = {
  reproduction: 'Reproduction',
  bisection: 'Bisection',
  verbal_estimation: 'Verbal estimation',
  two_interval_comparison: 'Two-interval comparison',
  temporal_order_judgement: 'Temporal order judgement',
  simultaneity_judgement: 'Simultaneity judgement',
  other: 'Other',
};
