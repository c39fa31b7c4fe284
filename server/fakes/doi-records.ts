// Invented CSL-JSON records the local DOI resolver serves (all under the test prefix 10.5555).
export const DEMO_DOI_RECORDS: Record<string, Record<string, unknown>> = {
  '10.5555/chrono.2017.001': {
    type: 'article-journal',
    title: 'Looming discs feel longer: expansion rate and perceived duration',
    author: [{ family: 'Varga', given: 'Ilse' }, { family: 'Noor', given: 'Tamsin' }],
    'container-title': 'Journal of Invented Psychophysics',
    issued: { 'date-parts': [[2017]] },
    volume: '12',
    page: '101-118',
  },
  '10.5555/chrono.2018.014': {
    type: 'article-journal',
    title: 'Filled and empty intervals in the auditory bisection task',
    author: [{ family: 'Okafor', given: 'Ada' }, { family: 'Lindqvist', given: 'Bo' }, { family: 'Serrano', given: 'Marta' }],
    'container-title': 'Imaginary Review of Timing',
    issued: { 'date-parts': [[2018]] },
    volume: '4',
    issue: '2',
  },
  '10.5555/chrono.2019.007': {
    type: 'article-journal',
    title: 'Audiovisual simultaneity windows in older adults',
    author: [{ family: 'Haddad', given: 'Rami' }, { family: 'Whitcombe', given: 'Jo' }],
    'container-title': 'Fictional Journal of Ageing and Perception',
    issued: { 'date-parts': [[2019]] },
    abstract: 'Older adults judged flash–beep pairs as simultaneous over a wider range of asynchronies than younger adults.',
  },
  '10.5555/chrono.2020.021': {
    type: 'article-journal',
    title: 'Numerosity inflates the reproduced duration of brief displays',
    author: [{ family: 'Mbeki', given: 'Lerato' }, { family: 'Castellanos', given: 'Iker' }],
    'container-title': 'Journal of Invented Psychophysics',
    issued: { 'date-parts': [[2020]] },
  },
  '10.5555/chrono.2021.033': {
    type: 'article-journal',
    title: 'Recalibration of temporal order after adaptation to a 150 ms lag',
    author: [{ family: 'Takahara', given: 'Emi' }],
    'container-title': 'Imaginary Review of Timing',
    issued: { 'date-parts': [[2021]] },
  },
  '10.5555/chrono.2022.045': {
    type: 'article-journal',
    title: 'Repetition shrinks subjective duration: an oddball study',
    author: [{ family: 'Ferreira', given: 'Nuno' }, { family: 'Adeyemi', given: 'Kemi' }],
    'container-title': 'Fictional Journal of Cognitive Timing',
    issued: { 'date-parts': [[2022]] },
  },
};

/** DOIs the resolver treats specially, so tests can cover time-outs and server errors. */
export const SLOW_DOI_PREFIX = '10.5555/slow.';
export const FAILING_DOI_PREFIX = '10.5555/fail.';
/** Any "10.5555/gen.<n>" resolves to a generated record (benchmarks, large imports). */
export const GENERATED_DOI_PREFIX = '10.5555/gen.';

export function generatedRecord(doi: string): Record<string, unknown> {
  const n = Number(doi.slice(GENERATED_DOI_PREFIX.length)) || 0;
  return {
    type: 'article-journal',
    title: `Generated timing record ${n}: interval ${100 + (n % 900)} ms`,
    author: [{ family: `Author${n % 97}`, given: 'Demo' }],
    'container-title': 'Generated Journal of Timing',
    issued: { 'date-parts': [[1990 + (n % 35)]] },
  };
}
