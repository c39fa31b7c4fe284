export const DESIGNS = ['within', 'between'] as const;
export type Design = (typeof DESIGNS)[number];

export const DESIGN_LABELS: Record<Design, string> = {
  within: 'Within subject',
  between: 'Between groups',
};
