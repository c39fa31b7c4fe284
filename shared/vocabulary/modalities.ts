export const MODALITIES = ['visual', 'auditory', 'tactile', 'audiovisual'] as const;
export type Modality = (typeof MODALITIES)[number];

export const MODALITY_LABELS: Record<Modality, string> = {
  visual: 'Visual',
  auditory: 'Auditory',
  tactile: 'Tactile',
  audiovisual: 'Audiovisual',
};
