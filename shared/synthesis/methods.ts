import { METHOD_LABELS, ONE_PER_STUDY_LABELS, type Dependence, type SynthesisRequest } from '../schemas/synthesis.js';

export interface PrismaCounts {
  /** records in the registry (every reference, duplicates included) */
  identified: number;
  duplicatesRemoved: number;
  screened: number;
  excluded: number;
  /** exclusion reasons with counts, where the screening records give them */
  excludedReasons?: Array<{ reason: string; count: number }>;
  included: number;
}

export interface MethodsInput {
  request: SynthesisRequest;
  metricLabel: string;
  counts: { effects: number; studies: number; references: number };
  software: { name: string; version: string };
  registryVersion: number | null;
  prisma: PrismaCounts | null;
  /** analyses that were not run (SynthesisOutput.unavailable), left out of the prose */
  notRun?: string[];
}

const CITATION: Record<SynthesisRequest['method'], string> = {
  DL: 'DerSimonian & Laird, 1986',
  REML: 'restricted maximum likelihood; Viechtbauer, 2005',
  PM: 'Paule & Mandel, 1982',
  FE: '',
};

export function dependenceSentence(d: Dependence): string {
  return d.mode === 'aggregate'
    ? `Where a study reported several effects, they were combined into one composite per study assuming a correlation of r = ${d.r.toFixed(2)} between them (Borenstein, Hedges, Higgins & Rothstein, 2009, ch. 24), so that no study counts twice.`
    : `Where a study reported several effects, one was kept per study: ${ONE_PER_STUDY_LABELS[d.rule]}.`;
}

/** A methods paragraph for a report, in plain prose with the citations the analysis rests on. */
export function methodsParagraph(m: MethodsInput): string {
  const { request: q, counts } = m;
  const level = `${Math.round(q.level * 1000) / 10}%`;
  const model =
    q.method === 'FE'
      ? `Effects (${m.metricLabel}) were pooled with an inverse-variance fixed-effect model.`
      : `Effects (${m.metricLabel}) were pooled with an inverse-variance random-effects model, the between-study variance τ² estimated by the ${METHOD_LABELS[q.method]} method (${CITATION[q.method]}).`;
  const hksj = q.hksj
    ? ` Confidence intervals used the Hartung–Knapp–Sidik–Jonkman adjustment with t on k − 1 degrees of freedom (Knapp & Hartung, 2003; IntHout, Ioannidis & Borm, 2014).`
    : '';
  const hetero =
    ` Heterogeneity is reported as Cochran's Q with its p value, I² and H² (Higgins & Thompson, 2002), τ² with a ${level} Q-profile interval (Viechtbauer, 2007), and a ${level} prediction interval with t on k − 2 degrees of freedom (Higgins, Thompson & Spiegelhalter, 2009).`;
  const skip = new Set(m.notRun ?? []);
  const smallStudy = [
    counts.studies >= 3 ? "Egger's regression test (Egger, Davey Smith, Schneider & Minder, 1997)" : '',
    skip.has("Begg's test") ? '' : "Begg's rank correlation (Begg & Mazumdar, 1994)",
    skip.has('trim-and-fill') ? '' : 'trim-and-fill (Duval & Tweedie, 2000)',
  ].filter(Boolean);
  const sensitivity = [skip.has('leave-one-out') || counts.studies < 2 ? '' : 'leave-one-out', skip.has('cumulative') ? '' : 'cumulative (by year)'].filter(Boolean);
  const bias =
    (smallStudy.length ? ` Small-study effects were examined with ${smallStudy.length > 1 ? `${smallStudy.slice(0, -1).join(', ')} and ${smallStudy.at(-1)}` : smallStudy[0]}.` : '') +
    (sensitivity.length ? ` ${sensitivity.join(' and ').replace(/^./, (c) => c.toUpperCase())} analyses were run for sensitivity.` : '');
  const extras = [
    q.subgroup ? ` Subgroups by ${q.subgroup} were compared with a Q test between subgroup estimates (separate τ² per subgroup).` : '',
    q.moderator ? ` A mixed-effects meta-regression on ${q.moderator === 'standardMs' ? 'standard duration (ms)' : 'publication year'} was fitted.` : '',
  ].join('');
  const p = m.prisma;
  const prisma = p
    ? ` Study flow (PRISMA 2020): ${p.identified} records identified in the registry, ${p.duplicatesRemoved} duplicates removed, ${p.screened} records screened, ${p.excluded} excluded${
        p.excludedReasons && p.excludedReasons.length ? ` (${p.excludedReasons.map((r) => `${r.reason}: ${r.count}`).join('; ')})` : ''
      }, ${p.included} included in the registry; of these, ${counts.references} ${counts.references === 1 ? 'reference' : 'references'} (${counts.studies} ${counts.studies === 1 ? 'study' : 'studies'}, ${counts.effects} ${counts.effects === 1 ? 'effect' : 'effects'}) met this synthesis's filters.`
    : ` ${counts.references} references (${counts.studies} studies, ${counts.effects} effects) met this synthesis's filters; screening counts were not available.`;
  const software = ` Computed with ${m.software.name} ${m.software.version}${m.registryVersion != null ? ` on registry version ${m.registryVersion}` : ''}.`;
  return model + hksj + hetero + ' ' + dependenceSentence(q.dependence) + bias + extras + prisma + software;
}
