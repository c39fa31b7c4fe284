import type { FlowStage, FlowStageKey, SynthesisFlow } from '../synthesis/flow.js';
import { referenceSourceLabel } from '../vocabulary/screening.js';
import { PLOT_COLORS, UI_FONT } from './theme.js';

/**
 * A PRISMA 2020 flow diagram of one synthesis's flow as a standalone SVG document: the records down the left
 * column, what each step set aside or left waiting to its right, the phases named along the left edge.
 */

const W = 760;
const PHASE_W = 26;
const MAIN_X = PHASE_W + 14;
const MAIN_W = 330;
const SIDE_X = MAIN_X + MAIN_W + 40;
const SIDE_W = W - SIDE_X - 10;
const LINE = 15;
const PAD = 8;
const GAP = 26;
const CHAR_W = 6.1; // 11px system UI, a generous average

const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
const n = (x: number) => x.toLocaleString('en-GB');

/** Greedy word wrap to a box width. */
export function wrap(text: string, width: number): string[] {
  const max = Math.max(8, Math.floor((width - 2 * PAD) / CHAR_W));
  const lines: string[] = [];
  let cur = '';
  for (const word of text.split(/\s+/).filter(Boolean)) {
    if (!cur) cur = word;
    else if (cur.length + 1 + word.length <= max) cur += ` ${word}`;
    else {
      lines.push(cur);
      cur = word;
    }
    while (cur.length > max) {
      lines.push(cur.slice(0, max - 1) + '-');
      cur = cur.slice(max - 1);
    }
  }
  if (cur) lines.push(cur);
  return lines;
}

interface Line {
  text: string;
  bold?: boolean;
  indent?: boolean;
}
interface Row {
  phase: 'Identification' | 'Screening' | 'Included';
  main: Line[];
  side: Line[] | null;
}

const lines = (items: Array<string | Line>, width: number): Line[] =>
  items.flatMap((it) => {
    const l = typeof it === 'string' ? { text: it } : it;
    return wrap(l.text, width - (l.indent ? 12 : 0)).map((text) => ({ ...l, text }));
  });

function rows(flow: SynthesisFlow): Row[] {
  const stage = (key: FlowStageKey) => flow.stages.find((s) => s.stage === key);
  const [coding, reconciliation, synthesis] = (['coding', 'reconciliation', 'synthesis'] as const).map((k) => stage(k)!);
  const sources = Object.entries(flow.identified.bySource)
    .filter(([, c]) => c > 0)
    .sort((a, b) => b[1] - a[1] || (a[0] < b[0] ? -1 : 1))
    .map(([s, c]) => ({ text: `${referenceSourceLabel(s)}: ${n(c)}`, indent: true }));
  const reasonLines = (r: FlowStage): Line[] => r.excludedByReason.map((x) => ({ text: `${x.label}: ${n(x.count)}`, indent: true }));
  const pending = (s: FlowStage): Line => ({ text: `${s.pendingLabel ? s.pendingLabel[0].toUpperCase() + s.pendingLabel.slice(1) : 'Waiting'} (n = ${n(s.pending)})`, bold: true });
  const e = flow.entering;
  return [
    {
      phase: 'Identification',
      main: lines([{ text: `Records identified in the registry (n = ${n(flow.identified.total)})`, bold: true }, ...sources], MAIN_W),
      side: lines(
        [
          { text: `Records removed before screening (n = ${n(flow.duplicatesRemoved.total)})`, bold: true },
          { text: `Duplicate entries at import: ${n(flow.duplicatesRemoved.importDuplicates)}`, indent: true },
          { text: `Duplicate references merged: ${n(flow.duplicatesRemoved.merged)}`, indent: true },
        ],
        SIDE_W,
      ),
    },
    ...screeningRows(stage, reasonLines, pending),
    { phase: 'Screening', main: lines([{ text: `Reports included for coding (n = ${n(coding.entered)})`, bold: true }], MAIN_W), side: lines([pending(coding)], SIDE_W) },
    { phase: 'Screening', main: lines([{ text: `Reports coded twice and compared (n = ${n(reconciliation.entered)})`, bold: true }], MAIN_W), side: lines([pending(reconciliation)], SIDE_W) },
    {
      phase: 'Screening',
      main: lines([{ text: `References with settled effects (n = ${n(synthesis.entered)})`, bold: true }], MAIN_W),
      side: lines([{ text: `Outside this synthesis’s filters (n = ${n(synthesis.excluded)})`, bold: true }, ...reasonLines(synthesis)], SIDE_W),
    },
    {
      phase: 'Included',
      main: lines(
        [
          { text: `Entering this synthesis (n = ${n(e.references)} ${e.references === 1 ? 'reference' : 'references'})`, bold: true },
          { text: `${n(e.studies)} ${e.studies === 1 ? 'study' : 'studies'}, ${n(e.effects)} ${e.effects === 1 ? 'effect' : 'effects'}`, indent: true },
        ],
        MAIN_W,
      ),
      side: null,
    },
  ];
}

type StageOf = (key: FlowStageKey) => FlowStage | undefined;

/** Title/abstract then full text, each with its exclusions by reason and what waits; a flow kept before the split has one screening box. */
function screeningRows(stage: StageOf, reasonLines: (s: FlowStage) => Line[], pending: (s: FlowStage) => Line): Row[] {
  const ta = stage('title_abstract');
  const ft = stage('full_text');
  const row = (s: FlowStage, main: string, excluded: string): Row => ({
    phase: 'Screening',
    main: lines([{ text: `${main} (n = ${n(s.entered)})`, bold: true }], MAIN_W),
    side: lines([{ text: `${excluded} (n = ${n(s.excluded)})`, bold: true }, ...reasonLines(s), pending(s)], SIDE_W),
  });
  if (ta && ft) return [row(ta, 'Records screened on title and abstract', 'Records excluded'), row(ft, 'Reports assessed in full text', 'Reports excluded')];
  const one = stage('screening');
  return one ? [row(one, one.label, 'Records excluded')] : [];
}

function textBlock(x: number, y: number, ls: Line[]): string {
  return ls
    .map((l, i) => `<text x="${x + PAD + (l.indent ? 12 : 0)}" y="${y + PAD + 11 + i * LINE}"${l.bold ? ' font-weight="600"' : ''}>${esc(l.text)}</text>`)
    .join('');
}

/** The diagram as an SVG document (UTF-8 text), titled. */
export function prismaFlowSvg(flow: SynthesisFlow, opts: { title?: string } = {}): string {
  const c = PLOT_COLORS;
  const title = opts.title ? wrap(opts.title, W - 20).slice(0, 3) : [];
  let y = 10 + (title.length ? title.length * 18 + 8 : 0);
  const parts: string[] = [];
  const placed: Array<{ phase: Row['phase']; top: number; bottom: number }> = [];
  let prevBottom: number | null = null;
  for (const r of rows(flow)) {
    const h = Math.max(r.main.length, r.side?.length ?? 0) * LINE + 2 * PAD;
    const mainH = r.main.length * LINE + 2 * PAD;
    const sideH = r.side ? r.side.length * LINE + 2 * PAD : 0;
    const mainTop = y + (h - mainH) / 2;
    if (prevBottom != null) parts.push(`<line x1="${MAIN_X + MAIN_W / 2}" y1="${prevBottom}" x2="${MAIN_X + MAIN_W / 2}" y2="${mainTop - 2}" stroke="${c.ink}" marker-end="url(#arrow)"/>`);
    parts.push(`<rect x="${MAIN_X}" y="${mainTop}" width="${MAIN_W}" height="${mainH}" fill="${r.phase === 'Included' ? c.pooledLight : c.paperDeep}" stroke="${c.ink}"/>`);
    parts.push(textBlock(MAIN_X, mainTop, r.main));
    if (r.side) {
      const sideTop = y + (h - sideH) / 2;
      parts.push(`<line x1="${MAIN_X + MAIN_W}" y1="${mainTop + mainH / 2}" x2="${SIDE_X - 2}" y2="${mainTop + mainH / 2}" stroke="${c.ink}" marker-end="url(#arrow)"/>`);
      parts.push(`<rect x="${SIDE_X}" y="${sideTop}" width="${SIDE_W}" height="${sideH}" fill="${c.paper}" stroke="${c.inkSoft}"/>`);
      parts.push(textBlock(SIDE_X, sideTop, r.side));
    }
    placed.push({ phase: r.phase, top: y, bottom: y + h });
    prevBottom = mainTop + mainH;
    y += h + GAP;
  }
  const height = y - GAP + 10;
  const phases: string[] = [];
  for (const p of ['Identification', 'Screening', 'Included'] as const) {
    const ofPhase = placed.filter((r) => r.phase === p);
    if (!ofPhase.length) continue;
    const top = ofPhase[0].top;
    const bottom = ofPhase[ofPhase.length - 1].bottom;
    const mid = (top + bottom) / 2;
    phases.push(`<rect x="4" y="${top}" width="${PHASE_W - 4}" height="${bottom - top}" fill="${c.action}"/>`);
    phases.push(`<text x="${4 + (PHASE_W - 4) / 2 + 4}" y="${mid}" transform="rotate(-90 ${4 + (PHASE_W - 4) / 2 + 4} ${mid})" text-anchor="middle" fill="${c.paper}" font-weight="600">${p}</text>`);
  }
  const heading = title.map((t, i) => `<text x="${MAIN_X}" y="${22 + i * 18}" font-size="14" font-weight="600">${esc(t)}</text>`).join('');
  const label = `PRISMA 2020 flow diagram${opts.title ? `: ${opts.title}` : ''}`;
  return [
    `<?xml version="1.0" encoding="UTF-8"?>`,
    `<svg xmlns="http://www.w3.org/2000/svg" width="${W}" height="${height}" viewBox="0 0 ${W} ${height}" role="img" aria-label="${esc(label)}" font-family="${esc(UI_FONT)}" font-size="11" fill="${c.ink}">`,
    `<title>${esc(label)}</title>`,
    `<defs><marker id="arrow" viewBox="0 0 10 10" refX="9" refY="5" markerWidth="7" markerHeight="7" orient="auto"><path d="M0,0 L10,5 L0,10 z" fill="${c.ink}"/></marker></defs>`,
    `<rect width="${W}" height="${height}" fill="${c.paper}"/>`,
    heading,
    ...phases,
    ...parts,
    `</svg>`,
    '',
  ].join('\n');
}
