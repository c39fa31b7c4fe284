export const POPULATIONS = ['healthy_adults', 'children', 'older_adults', 'clinical'] as const;
export type Population = (typeof POPULATIONS)[number];

export const POPULATION_LABELS: Record<Population, string> = {
  healthy_adults: 'Healthy adults',
  children: 'Children',
  older_adults: 'Older adults',
  clinical: 'Clinical group',
};
