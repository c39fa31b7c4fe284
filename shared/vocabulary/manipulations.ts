/** The seeded manipulation vocabulary (term is a stable slug; curators may relabel or retire). */
export const DEFAULT_MANIPULATIONS: ReadonlyArray<{ term: string; label: string; description: string }> = [
  { term: 'luminance', label: 'Luminance', description: 'Brighter versus dimmer stimuli of the same physical duration.' },
  { term: 'size', label: 'Size', description: 'Larger versus smaller stimuli.' },
  { term: 'numerosity', label: 'Numerosity', description: 'More versus fewer items in the display.' },
  { term: 'speed_motion', label: 'Speed / motion', description: 'Moving or faster stimuli versus static or slower ones.' },
  { term: 'looming_receding', label: 'Looming vs receding', description: 'Approaching versus receding stimuli.' },
  { term: 'flicker_rate', label: 'Flicker rate', description: 'Temporal frequency of a flickering stimulus.' },
  { term: 'loudness', label: 'Loudness', description: 'Louder versus softer tones.' },
  { term: 'pitch', label: 'Pitch', description: 'Higher versus lower pitched tones.' },
  { term: 'repetition', label: 'Repetition', description: 'Repeated versus first-presented stimuli.' },
  { term: 'novelty_oddball', label: 'Novelty / oddball', description: 'An oddball among repeated standards.' },
  { term: 'expectation', label: 'Expectation', description: 'Expected versus unexpected stimuli or timing.' },
  { term: 'emotional_arousal', label: 'Emotional arousal', description: 'Arousing versus neutral stimuli.' },
  { term: 'threat', label: 'Threat', description: 'Threatening versus safe contexts or stimuli.' },
  { term: 'delay_adaptation', label: 'Delay adaptation', description: 'Exposure to a constant intersensory or action–outcome delay.' },
  { term: 'saccade', label: 'Saccade', description: 'Stimuli presented around a saccadic eye movement.' },
  { term: 'voluntary_action', label: 'Voluntary action', description: 'Self-initiated versus passive or externally triggered events.' },
];
