import { METHOD_LABELS, ONE_PER_STUDY_LABELS, SENSITIVITY_RS, type Dependence, type SynthesisRequest } from '../schemas/synthesis.js';
import { labelOf } from '../vocabulary/labels.js';
import { OUTCOMES, type OutcomeKind } from '../vocabulary/outcomes.js';
import { SIGN_CONVENTIONS, effectQuantity, quantityLabel, type Parameter, type Unit } from '../vocabulary/parameters.js';
import { i2Definition } from './analyses.js';

export interface PrismaCounts {
  /** records in the registry (every reference, duplicates included) */
  identified: number;
  duplicatesRemoved: number;
  screened: number;
  excluded: number;
  /** exclusion reasons with counts, where the screening records give them */
  excludedReasons?: Array<{ reason: string; count: number }>;
  included: number;
  /** per-synthesis flow (snapshots saved since): records not yet screened, references coded and settled */
  notYetScreened?: number;
  coded?: number;
  settled?: number;
  /** per screening stage (snapshots saved since the split): title and abstract, then full text */
  stages?: { titleAbstract: PrismaStageCounts; fullText: PrismaStageCounts };
}

export interface PrismaStageCounts {
  decided: number;
  excluded: number;
  /** exclusion reasons in words with counts, largest first */
  excludedReasons: Array<{ reason: string; count: number }>;
  waiting: number;
}

const reasonList = (rs: Array<{ reason: string; count: number }> | undefined) => (rs && rs.length ? ` (${rs.map((r) => `${r.reason}: ${r.count}`).join('; ')})` : '');

/** The screening part of the study-flow sentence: per stage when the counts have stages, else over both. */
function screeningClause(p: PrismaCounts): string {
  if (p.stages) {
    const { titleAbstract: ta, fullText: ft } = p.stages;
    return (
      `${ta.decided} records screened on title and abstract, ${ta.excluded} excluded${reasonList(ta.excludedReasons)}, ${ta.waiting} not yet screened; ` +
      `${ft.decided} reports assessed in full text, ${ft.excluded} excluded${reasonList(ft.excludedReasons)}, ${ft.waiting} awaiting full-text screening;`
    );
  }
  return `${p.screened} records screened, ${p.excluded} excluded${reasonList(p.excludedReasons)}${p.notYetScreened != null ? `, ${p.notYetScreened} not yet screened` : ''},`;
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
  /** what the pooled effects measured and how many had their sign reversed (pooledQuantityOf); absent: not said */
  quantity?: PooledQuantity | null;
}

const listed = (xs: string[]) => (xs.length > 1 ? `${xs.slice(0, -1).join(', ')} and ${xs.at(-1)}` : xs[0]);

/** What a synthesis pooled: outcome kind, parameter and unit (one each, as a synthesis pools), and the reversed signs. */
export interface PooledQuantity {
  outcomes: string[];
  /** quantity labels, e.g. "PSE (ms)" */
  quantities: string[];
  effects: number;
  signReversed: number;
}

type QuantityOfEffect = { outcome: string; parameter?: string | null; unit?: string | null; signReversed?: boolean };

/** The pooled quantity of the effects a synthesis ran on (an effect coded before parameters takes its outcome kind's usual one). */
export function pooledQuantityOf(effects: readonly QuantityOfEffect[]): PooledQuantity {
  const outcomes = new Set<string>();
  const quantities = new Set<string>();
  let signReversed = 0;
  for (const e of effects) {
    outcomes.add(e.outcome);
    const q = effectQuantity({ outcome: e.outcome as OutcomeKind, parameter: (e.parameter ?? null) as Parameter | null, unit: (e.unit ?? null) as Unit | null });
    if (q) quantities.add(quantityLabel(q.parameter, q.unit));
    if (e.signReversed) signReversed += 1;
  }
  return { outcomes: [...outcomes], quantities: [...quantities], effects: effects.length, signReversed };
}

/** The sentence naming what was pooled, its unit, the sign convention and how many effects' signs were reversed. */
export function quantitySentence(q: PooledQuantity | null | undefined): string {
  if (!q || !q.outcomes.length) return '';
  const kinds = q.outcomes.map((o) => OUTCOMES[o as OutcomeKind]?.label.toLowerCase() ?? o);
  const conventions = q.outcomes.map((o) => SIGN_CONVENTIONS[o as OutcomeKind]).filter(Boolean);
  const what = q.quantities.length ? ` was ${listed(q.quantities)}` : '';
  const reversed =
    q.signReversed === 0
      ? ' No effect\'s sign was reversed.'
      : `${q.effects === 1 ? ' The effect' : ` Of the ${q.effects} effects, ${q.signReversed}`} had ${q.signReversed === 1 ? 'its' : 'their'} sign reversed when coded, to keep this convention where a lower value meant lengthening in the study's task; the reported values were kept as reported.`;
  return ` The pooled parameter (unit)${what}, for ${listed(kinds)}${conventions.length ? `; sign convention: ${conventions.join('; ')}` : ''}.${reversed}`;
}

const CITATION: Record<SynthesisRequest['method'], string> = {
  DL: 'DerSimonian & Laird, 1986',
  REML: 'restricted maximum likelihood; Viechtbauer, 2005',
  PM: 'Paule & Mandel, 1982',
  FE: '',
};

export function dependenceSentence(d: Dependence, papers?: number): string {
  if (d.mode === 'multilevel')
    return (
      `Every effect was kept; effects were nested in their papers in a three-level random-effects model (effects within ${papers != null ? `${papers} ${papers === 1 ? 'paper' : 'papers'}` : 'papers'} as clusters; Konstantopoulos, 2011; Cheung, 2014), its between-paper and within-paper variances estimated by restricted maximum likelihood, so that no paper counts twice.` +
      (d.robust
        ? ' The pooled test and interval used the cluster-robust CR2 variance estimator, clustered by paper, with Satterthwaite degrees of freedom (Tipton, 2015; Pustejovsky & Tipton, 2018).'
        : ' The pooled test and interval used the model-based variance.')
    );
  if (d.mode === 'aggregate')
    return d.weighted
      ? `Where a study reported several effects, they were combined into one inverse-variance composite per study under a compound-symmetric covariance with r = ${d.r.toFixed(2)} between them (generalised least squares, as metafor's aggregate.escalc with weighted = TRUE; Viechtbauer, 2010), so that no study counts twice; a sensitivity table repeats the analysis at r = ${SENSITIVITY_RS.join(', ')}.`
      : `Where a study reported several effects, they were combined into one composite per study assuming a correlation of r = ${d.r.toFixed(2)} between them (Borenstein, Hedges, Higgins & Rothstein, 2009, ch. 24), so that no study counts twice; a sensitivity table repeats the analysis at r = ${SENSITIVITY_RS.join(', ')}.`;
  return `Where a study reported several effects, one was kept per study: ${ONE_PER_STUDY_LABELS[d.rule]}.`;
}

/** The model sentences of a three-level synthesis (replacing the two-level model, HKSJ and heterogeneity ones). */
function multilevelModel(m: MethodsInput, level: string): string {
  const q = m.request;
  return (
    `Effects (${m.metricLabel}) were pooled with an inverse-variance three-level random-effects model.` +
    (q.hksj && !(q.dependence.mode === 'multilevel' && q.dependence.robust) ? ` Model-based tests used t on k − 1 degrees of freedom.` : '') +
    ` Heterogeneity is reported as Cochran's Q with its p value, I² split into its between-paper and within-paper parts (Cheung, 2014) with the typical within-study variance of Higgins & Thompson (2002), and a ${level} prediction interval from the two variance components.`
  );
}

/** What pooling a family of standardized mean differences means, when the request asks for it. */
export function smdFamilySentence(q: Pick<SynthesisRequest, 'smdFamily'>): string {
  if (q.smdFamily !== 'raw_score') return '';
  return (
    ' At the reviewer\'s request ("smdFamily": "raw_score"), standardized mean differences with a raw-score standardizer were pooled together as one metric:' +
    ' g_s (independent groups, pooled SD), g_av (within subject, average of the condition SDs) and g_rm (within subject, raw-score SD from the SD of the differences and r), which estimate the same standardized difference (Morris & DeShon, 2002; Lakens, 2013);' +
    ' g_z, standardized by the SD of the differences, was not pooled with them.'
  );
}

/** Which flagged effects the request left out (computed from a bound; approximate, from medians). */
export function flaggedSentence(q: Pick<SynthesisRequest, 'filters'>): string {
  const out = [
    q.filters.excludeBound ? 'computed from a reported bound (p below a value)' : '',
    q.filters.excludeApproximate ? 'whose means and SDs were estimated from medians with quartiles or range (Wan, Wang, Liu & Tong, 2014)' : '',
  ].filter(Boolean);
  return out.length ? ` Effects ${out.join(' and effects ')} were left out.` : '';
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
  const i2 =
    q.method === 'FE' ? 'I² and H² from Q' : i2Definition(q.method) === 'tau' ? `I² and H² from the ${METHOD_LABELS[q.method]} τ² and the typical within-study variance` : 'I² and H² from Q (for DerSimonian–Laird the same as from its τ²)';
  const hetero =
    ` Heterogeneity is reported as Cochran's Q with its p value, ${i2} (Higgins & Thompson, 2002) in the pooled row and in every leave-one-out and cumulative row, τ² with a ${level} Q-profile interval (Viechtbauer, 2007), and a ${level} prediction interval with t on k − 2 degrees of freedom (Higgins, Thompson & Spiegelhalter, 2009).`;
  const skip = new Set(m.notRun ?? []);
  const multilevel = q.dependence.mode === 'multilevel';
  const smallStudy = multilevel ? [] : [
    counts.studies >= 3 ? "Egger's regression test (Egger, Davey Smith, Schneider & Minder, 1997)" : '',
    skip.has("Begg's test") ? '' : "Begg's rank correlation (Begg & Mazumdar, 1994; the exact p of Kendall's statistic for up to 50 studies without ties, else the normal approximation)",
    skip.has('trim-and-fill') ? '' : 'trim-and-fill (Duval & Tweedie, 2000)',
  ].filter(Boolean);
  const sensitivity = multilevel
    ? [skip.has('leave-one-out') ? '' : 'leave-one-paper-out', skip.has('cumulative') ? '' : 'cumulative (by paper year, the first paper alone by REML among its effects)'].filter(Boolean)
    : [skip.has('leave-one-out') || counts.studies < 2 ? '' : 'leave-one-out', skip.has('cumulative') ? '' : 'cumulative (by year)'].filter(Boolean);
  const bias =
    (smallStudy.length ? ` Small-study effects were examined with ${smallStudy.length > 1 ? `${smallStudy.slice(0, -1).join(', ')} and ${smallStudy.at(-1)}` : smallStudy[0]}.` : '') +
    (sensitivity.length ? ` ${sensitivity.join(' and ').replace(/^./, (c) => c.toUpperCase())} analyses were run for sensitivity.` : '');
  const extras = [
    q.subgroup
      ? !multilevel && q.subgroupTau2 === 'pooled'
        ? ` Subgroups by ${labelOf('subgroup', q.subgroup).toLowerCase()} were compared in a mixed-effects model with the subgroup as a factor and one τ² shared by all subgroups, tested by the ${q.hksj ? 'Knapp–Hartung F test' : 'omnibus χ² test'} of the factor.`
        : ` Subgroups by ${labelOf('subgroup', q.subgroup).toLowerCase()} were compared with a Q test between subgroup estimates (${multilevel ? 'a separate three-level fit' : 'separate τ²'} per subgroup).`
      : '',
    q.moderator ? ` A ${multilevel ? 'three-level' : 'mixed-effects'} meta-regression on ${labelOf('moderator', q.moderator).toLowerCase()} was fitted${!multilevel && q.hksj ? ' with the Knapp–Hartung t test on k − 2 degrees of freedom' : ''}.` : '',
    q.moderators && !multilevel && !skip.has('meta-regression on several moderators')
      ? ` A mixed-effects meta-regression on ${listed(q.moderators.map((m) => labelOf('moderator', m).toLowerCase()))} at once was fitted (categories coded as indicators against their first level; residual τ² by the ${METHOD_LABELS[q.method]} method), ${
          q.hksj ? 'with Knapp–Hartung t tests on k − p degrees of freedom and an F test of the moderators (Knapp & Hartung, 2003)' : 'with Wald z tests and an omnibus χ² test of the moderators'
        }, residual heterogeneity Q_E and the proportion of τ² explained (R²; Raudenbush, 2009).`
      : '',
    multilevel ? " Egger's test, Begg's test and trim-and-fill assume independent effects and were not run." : '',
  ].join('');
  const p = m.prisma;
  const prisma = p
    ? ` Study flow (PRISMA 2020): ${p.identified} records identified in the registry, ${p.duplicatesRemoved} duplicates removed, ${screeningClause(p)} ${p.included} included in the registry${
        p.coded != null && p.settled != null ? `, ${p.coded} coded and ${p.settled} with settled effects` : ''
      }; of these, ${counts.references} ${counts.references === 1 ? 'reference' : 'references'} (${counts.studies} ${counts.studies === 1 ? 'study' : 'studies'}, ${counts.effects} ${counts.effects === 1 ? 'effect' : 'effects'}) met this synthesis's filters.`
    : ` ${counts.references} references (${counts.studies} studies, ${counts.effects} effects) met this synthesis's filters; screening counts were not available.`;
  const software = ` Computed with ${m.software.name} ${m.software.version}${m.registryVersion != null ? ` on registry version ${m.registryVersion}` : ''}.`;
  const head = (multilevel ? multilevelModel(m, level) : model + hksj + hetero) + quantitySentence(m.quantity) + smdFamilySentence(q) + flaggedSentence(q);
  return head + ' ' + dependenceSentence(q.dependence, counts.references) + bias + extras + prisma + software;
}

/** A short statement of the model and the dependence handling, for option lists (snapshot page, exports). */
export function modelLabel(q: SynthesisRequest): string {
  const d = q.dependence;
  if (d.mode === 'multilevel') return `three-level model (effects within papers, REML)${d.robust ? ' with CR2 robust variance and Satterthwaite df' : ', model-based variance'}`;
  const model = `${METHOD_LABELS[q.method]}${q.hksj ? ' with HKSJ' : ''}`;
  return d.mode === 'aggregate'
    ? `${model}; effects within a study combined with r = ${d.r.toFixed(2)}${d.weighted ? ' (inverse-variance composite)' : ''}`
    : `${model}; one effect per study: ${ONE_PER_STUDY_LABELS[d.rule]}`;
}
