// The client report as a PDF: everything drawn as vectors (traces, marks, tables) so it prints sharply.
import path from 'node:path';
import PDFDocument from 'pdfkit';
import { clientCautionParagraphs, pleaseSeeClinician, rangeStatusWords } from '@/shared/cautions';

export type ReportSound = { type: 'S1' | 'S2'; startS: number; endS: number };
/** A display trace: `values` in -1..1, evenly spaced over `durationS`. */
export type ReportTrace = { durationS: number; values: number[] };
export type ReportMeasurement = {
  key: string;
  label: string;
  /** The reading in words, as the screens show it. */
  reading: string;
  unit: string;
  value: number | null;
  range: { low: number | null; high: number | null; sourceIndex: number } | null;
  status: 'in_range' | 'below' | 'above' | 'no_range' | 'no_value';
};
export type ReportSite = {
  site: string;
  label: string;
  quality: string | null;
  trace: ReportTrace | null;
  sounds: ReportSound[];
  measurements: ReportMeasurement[];
};
export type ReportComparisonRow = {
  site: string;
  key: string;
  label: string;
  unit: string;
  then: number | null;
  now: number | null;
};
export type ReportInput = {
  /** The session's referral as the session view shows it; when flagged, the report says so first. */
  referral: { flagged: boolean; reasons: string[] };
  clinicName: string;
  clinicAddress: string | null;
  /** PNG or JPEG bytes of the clinic's logo from Settings. */
  clinicLogo: Buffer | null;
  clientName: string;
  /** Dates below are written for the reader (the clinic's zone, the document locale). */
  clientDateOfBirth: string | null;
  /** The visit's calendar day (YYYY-MM-DD), for file names. */
  sessionDay: string;
  sessionDate: string;
  operatorName: string | null;
  practitionerName: string | null;
  sites: ReportSite[];
  comparison: { date: string; rows: ReportComparisonRow[] } | null;
  findings: string | null;
  plan: string | null;
  followUpDate: string | null;
  sources: string[];
  generatedAt: string;
};

const fontDir = path.resolve(__dirname, '../../../node_modules/@expo-google-fonts');
const FONT = { body: 'Body', strong: 'Strong', heading: 'Heading' };
const INK = '#12343B';
const MUTED = '#5A6669';
const LINE = '#DCD4C4';
const ACCENT = '#C4512F';
const PULSE = '#2E8C7E';
const CAUTION_BG = '#FBF0D6';
const CAUTION_FG = '#8A5A0B';
const MARGIN = 40;
const TRACE_SECONDS = 6;

function fmt(value: number | null, digits = 2): string {
  if (value === null || !Number.isFinite(value)) return '–';
  const d = Number.isInteger(value) || Math.abs(value) >= 100 ? 0 : Math.abs(value) >= 10 ? 1 : digits;
  return value.toFixed(d);
}

export function rangeText(range: ReportMeasurement['range']): string {
  if (!range) return 'no range set';
  if (range.low !== null && range.high !== null) return `${fmt(range.low)}–${fmt(range.high)}`;
  if (range.low !== null) return `at least ${fmt(range.low)}`;
  if (range.high !== null) return `at most ${fmt(range.high)}`;
  return 'no range set';
}

export const statusText = (status: ReportMeasurement['status']): string =>
  rangeStatusWords(status, pleaseSeeClinician);

function drawTrace(
  doc: PDFKit.PDFDocument,
  site: ReportSite,
  x: number,
  y: number,
  w: number,
  h: number,
): void {
  doc.save();
  doc.roundedRect(x, y, w, h, 4).lineWidth(0.6).strokeColor(LINE).stroke();
  doc
    .font(FONT.strong)
    .fontSize(9)
    .fillColor(INK)
    .text(site.label, x + 6, y + 4, { lineBreak: false });
  if (site.quality)
    doc
      .font(FONT.body)
      .fontSize(7.5)
      .fillColor(MUTED)
      .text(`quality: ${site.quality}`, x + w - 80, y + 5, { width: 74, align: 'right' });
  const plot = { x: x + 6, y: y + 27, w: w - 12, h: h - 43 };
  if (!site.trace || site.trace.values.length < 2) {
    doc
      .font(FONT.body)
      .fontSize(8)
      .fillColor(MUTED)
      .text('No clip for this site.', plot.x, plot.y + plot.h / 2 - 4);
    doc.restore();
    return;
  }
  // A few seconds, so each S1 and S2 stays legible in print.
  const durationS = Math.min(site.trace.durationS, TRACE_SECONDS);
  const values = site.trace.values.slice(
    0,
    Math.max(2, Math.round((durationS / site.trace.durationS) * site.trace.values.length)),
  );
  const tx = (t: number) => plot.x + (t / durationS) * plot.w;
  const mid = plot.y + plot.h / 2;
  for (const s of site.sounds.filter((x) => x.startS < durationS)) {
    const x0 = tx(Math.max(0, s.startS));
    const x1 = tx(Math.min(durationS, s.endS));
    doc
      .rect(x0, plot.y, Math.max(0.5, x1 - x0), plot.h)
      .fillOpacity(0.16)
      .fill(s.type === 'S1' ? ACCENT : PULSE);
    doc
      .fillOpacity(1)
      .font(FONT.strong)
      .fontSize(5.5)
      .fillColor(s.type === 'S1' ? ACCENT : PULSE);
    doc.text(s.type, x0, plot.y - 7, { lineBreak: false });
  }
  doc.fillOpacity(1);
  const step = plot.w / (values.length - 1);
  doc.moveTo(plot.x, mid - values[0] * (plot.h / 2));
  for (let i = 1; i < values.length; i++)
    doc.lineTo(plot.x + i * step, mid - Math.max(-1, Math.min(1, values[i])) * (plot.h / 2));
  doc.lineWidth(0.5).strokeColor(INK).stroke();
  doc.font(FONT.body).fontSize(6).fillColor(MUTED);
  const tick = durationS > 8 ? 2 : 1;
  for (let t = 0; t <= durationS + 1e-6; t += tick) {
    doc
      .moveTo(tx(t), plot.y + plot.h)
      .lineTo(tx(t), plot.y + plot.h + 2)
      .lineWidth(0.4)
      .strokeColor(MUTED)
      .stroke();
    doc.text(`${t}s`, tx(t) - 6, plot.y + plot.h + 3, { width: 12, align: 'center', lineBreak: false });
  }
  doc.restore();
}

type Column = { title: string; width: number; align?: 'left' | 'right' };

function table(
  doc: PDFKit.PDFDocument,
  columns: Column[],
  rows: { cells: string[]; flagged?: boolean[] }[],
  startY: number,
): number {
  let y = startY;
  const rowHeight = (cells: string[]) =>
    Math.max(
      12,
      ...cells.map(
        (c, i) =>
          doc
            .font(FONT.body)
            .fontSize(7.5)
            .heightOfString(c, { width: columns[i].width - 4 }) + 4,
      ),
    );
  const header = () => {
    let x = MARGIN;
    doc.font(FONT.strong).fontSize(7.5).fillColor(MUTED);
    for (const c of columns) {
      doc.text(c.title, x + 2, y, { width: c.width - 4, align: c.align ?? 'left' });
      x += c.width;
    }
    y += 12;
    doc
      .moveTo(MARGIN, y - 2)
      .lineTo(MARGIN + columns.reduce((s, c) => s + c.width, 0), y - 2)
      .lineWidth(0.5)
      .strokeColor(LINE)
      .stroke();
  };
  header();
  for (const row of rows) {
    const h = rowHeight(row.cells);
    if (y + h > doc.page.height - 70) {
      doc.addPage();
      y = MARGIN;
      header();
    }
    let x = MARGIN;
    row.cells.forEach((cell, i) => {
      const strong = row.flagged?.[i - (row.cells.length - (row.flagged?.length ?? 0))] === true;
      doc
        .font(strong ? FONT.strong : FONT.body)
        .fontSize(7.5)
        .fillColor(strong ? ACCENT : INK);
      doc.text(cell, x + 2, y + 1, { width: columns[i].width - 4, align: columns[i].align ?? 'left' });
      x += columns[i].width;
    });
    y += h;
  }
  return y + 6;
}

function heading(doc: PDFKit.PDFDocument, text: string, y: number): number {
  if (y > doc.page.height - 120) {
    doc.addPage();
    y = MARGIN;
  }
  doc.font(FONT.heading).fontSize(12).fillColor(INK).text(text, MARGIN, y);
  return y + 18;
}

function cautionBox(doc: PDFKit.PDFDocument, y: number): number {
  const width = doc.page.width - 2 * MARGIN;
  const text = clientCautionParagraphs.join(' ');
  const h =
    doc
      .font(FONT.body)
      .fontSize(7.5)
      .heightOfString(text, { width: width - 16 }) + 22;
  if (y + h > doc.page.height - 60) {
    doc.addPage();
    y = MARGIN;
  }
  doc.roundedRect(MARGIN, y, width, h, 4).fill(CAUTION_BG);
  doc
    .font(FONT.strong)
    .fontSize(8)
    .fillColor(CAUTION_FG)
    .text('Wellness follow-up only', MARGIN + 8, y + 6);
  doc
    .font(FONT.body)
    .fontSize(7.5)
    .fillColor(INK)
    .text(text, MARGIN + 8, y + 17, { width: width - 16 });
  return y + h + 8;
}

function referralBox(doc: PDFKit.PDFDocument, referral: ReportInput['referral'], y: number): number {
  const width = doc.page.width - 2 * MARGIN;
  if (!referral.flagged) {
    doc
      .font(FONT.body)
      .fontSize(9)
      .fillColor(INK)
      .text('Nothing in this visit calls for a referral.', MARGIN, y, { width });
    return doc.y + 10;
  }
  doc
    .font(FONT.strong)
    .fontSize(11)
    .fillColor(ACCENT)
    .text('Please see a licensed clinician', MARGIN, y, { width });
  for (const reason of referral.reasons) {
    doc
      .font(FONT.body)
      .fontSize(9)
      .fillColor(INK)
      .text(`• ${reason}`, MARGIN + 8, doc.y + 2, { width: width - 8 });
  }
  return doc.y + 10;
}

/** A4 with the report's fonts; `done` resolves with the bytes once the document is ended. */
function openDocument(input: ReportInput): { doc: PDFKit.PDFDocument; done: Promise<Buffer> } {
  const doc = new PDFDocument({
    size: 'A4',
    margin: MARGIN,
    bufferPages: true,
    info: {
      Title: `Heart-sound follow-up report, ${input.clientName}, ${input.sessionDate}`,
      Author: input.clinicName,
      Creator: 'Fourpoint',
    },
  });
  doc.registerFont(FONT.body, path.join(fontDir, 'inter/400Regular/Inter_400Regular.ttf'));
  doc.registerFont(FONT.strong, path.join(fontDir, 'inter/600SemiBold/Inter_600SemiBold.ttf'));
  doc.registerFont(
    FONT.heading,
    path.join(fontDir, 'space-grotesk/600SemiBold/SpaceGrotesk_600SemiBold.ttf'),
  );
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  return { doc, done };
}

const contentWidth = (doc: PDFKit.PDFDocument): number => doc.page.width - 2 * MARGIN;

/** The clinic's logo, name and address, and the report's title; answers the y below them. */
function letterhead(doc: PDFKit.PDFDocument, input: ReportInput): number {
  const width = contentWidth(doc);
  let textLeft = MARGIN;
  if (input.clinicLogo) {
    try {
      doc.image(input.clinicLogo, MARGIN, MARGIN, { fit: [56, 56] });
      textLeft = MARGIN + 66;
    } catch {
      // A logo pdfkit cannot read is left out rather than losing the report.
    }
  }
  doc.font(FONT.heading).fontSize(18).fillColor(INK).text(input.clinicName, textLeft, MARGIN);
  if (input.clinicAddress)
    doc
      .font(FONT.body)
      .fontSize(8.5)
      .fillColor(MUTED)
      .text(input.clinicAddress.replace(/\s*\n\s*/g, ', '), textLeft, doc.y, {
        width: width - (textLeft - MARGIN),
      });
  doc
    .font(FONT.body)
    .fontSize(10)
    .fillColor(MUTED)
    .text('Heart-sound follow-up report', textLeft, doc.y + 2);
  doc.y = Math.max(doc.y, input.clinicLogo ? MARGIN + 60 : 0);
  return doc.y + 8;
}

/** Who the visit was for, when, and who recorded and reviewed it. */
function visitFacts(doc: PDFKit.PDFDocument, input: ReportInput, y: number): number {
  const width = contentWidth(doc);
  const facts: [string, string][] = [
    ['Client', input.clientName + (input.clientDateOfBirth ? ` (born ${input.clientDateOfBirth})` : '')],
    ['Visit', input.sessionDate],
    ['Recorded by', input.operatorName ?? '–'],
    ['Reviewed by', input.practitionerName ?? '–'],
  ];
  for (const [k, v] of facts) {
    doc.font(FONT.strong).fontSize(9).fillColor(MUTED).text(k, MARGIN, y, { width: 80 });
    doc
      .font(FONT.body)
      .fontSize(9)
      .fillColor(INK)
      .text(v, MARGIN + 80, y, { width: width - 80 });
    y += 13;
  }
  return y;
}

/** The four sites' traces, two by two, with the key to their marks. */
function sitesSection(doc: PDFKit.PDFDocument, sites: ReportSite[], y: number): number {
  const width = contentWidth(doc);
  y = heading(doc, 'The four sites', y);
  const cellW = (width - 10) / 2;
  const cellH = 120;
  sites.forEach((site, i) => {
    drawTrace(doc, site, MARGIN + (i % 2) * (cellW + 10), y + Math.floor(i / 2) * (cellH + 8), cellW, cellH);
  });
  y += 2 * (cellH + 8) + 4;
  doc
    .font(FONT.body)
    .fontSize(7)
    .fillColor(MUTED)
    .text('Shaded bands mark the detected S1 (first) and S2 (second) heart sounds.', MARGIN, y);
  return y + 16;
}

/** A range with its source's number in the Sources list, as "50–90 [1]". */
const citedRange = (range: NonNullable<ReportMeasurement['range']>): string =>
  `${rangeText(range)}${range.sourceIndex >= 0 ? ` [${range.sourceIndex + 1}]` : ''}`;

/** A value with the side of its range it falls outside, if it does. */
function markedValue(m: ReportMeasurement | undefined): string {
  if (!m) return '–';
  if (m.status === 'above') return `${fmt(m.value)} above`;
  if (m.status === 'below') return `${fmt(m.value)} below`;
  return fmt(m.value);
}

/** One row per measurement, one column per site; a range shared by every site is said once. */
function measurementsTable(doc: PDFKit.PDFDocument, sites: ReportSite[], y: number): number {
  const width = contentWidth(doc);
  y = heading(doc, 'Measurements', y);
  const siteW = (width - 150 - 110) / 4;
  const grid: Column[] = [
    { title: 'Measurement', width: 150 },
    { title: 'Usual range', width: 110 },
    ...sites.map((s) => ({ title: s.label, width: siteW, align: 'right' as const })),
  ];
  const rowsOf = sites[0]?.measurements ?? [];
  return table(
    doc,
    grid,
    rowsOf.map((first, i) => {
      const cells = sites.map((s) => s.measurements[i]);
      const sameRange = cells.every((m) => rangeText(m?.range ?? null) === rangeText(first.range));
      return {
        cells: [
          first.unit ? `${first.label} (${first.unit})` : first.label,
          sameRange
            ? first.range
              ? citedRange(first.range)
              : 'no range set'
            : 'differs by site, under each value',
          ...cells.map((m) =>
            sameRange || !m
              ? markedValue(m)
              : `${markedValue(m)}\n${m.range ? citedRange(m.range) : 'no range'}`,
          ),
        ],
        flagged: cells.map((m) => m?.status === 'above' || m?.status === 'below'),
      };
    }),
    y,
  );
}

/** Every measurement outside the clinic's range, in words, or that there is none. */
function outsideRangeList(doc: PDFKit.PDFDocument, sites: ReportSite[], y: number): number {
  const width = contentWidth(doc);
  const outside = sites.flatMap((s) =>
    s.measurements
      .filter((m) => m.status === 'above' || m.status === 'below')
      .map((m) => ({ site: s.label, m })),
  );
  doc.font(FONT.body).fontSize(7.5).fillColor(INK);
  if (outside.length === 0) {
    doc.text('Every measurement with a range is within it.', MARGIN, y, { width });
  } else {
    doc.font(FONT.strong).fillColor(ACCENT).text("Outside the clinic's range:", MARGIN, y, { width });
    for (const { site, m } of outside) {
      doc
        .font(FONT.body)
        .fillColor(INK)
        .text(
          `${site}, ${m.label}: ${fmt(m.value)}${m.unit ? ` ${m.unit}` : ''} (range ${rangeText(m.range)}). ${m.reading}.`,
          MARGIN + 8,
          doc.y + 1,
          { width: width - 8 },
        );
    }
  }
  return doc.y + 12;
}

/** Each measurement then and now at each site, with the change. */
function comparisonTable(
  doc: PDFKit.PDFDocument,
  comparison: NonNullable<ReportInput['comparison']>,
  sites: ReportSite[],
  y: number,
): number {
  const width = contentWidth(doc);
  y = heading(doc, `Compared with the visit of ${comparison.date}`, y);
  const keys = [...new Set(comparison.rows.map((r) => r.key))];
  const siteLabels = sites.map((s) => s.label);
  const cw = (width - 150) / 4;
  return table(
    doc,
    [
      { title: 'Measurement (then → now, change)', width: 150 },
      ...siteLabels.map((l) => ({ title: l, width: cw, align: 'right' as const })),
    ],
    keys.map((key) => {
      const any = comparison.rows.find((r) => r.key === key)!;
      return {
        cells: [
          any.unit ? `${any.label} (${any.unit})` : any.label,
          ...siteLabels.map((label) => {
            const r = comparison.rows.find((x) => x.key === key && x.site === label);
            if (!r) return '–';
            const change =
              r.then !== null && r.now !== null
                ? ` (${r.now - r.then >= 0 ? '+' : ''}${fmt(r.now - r.then)})`
                : '';
            return `${fmt(r.then)} → ${fmt(r.now)}${change}`;
          }),
        ],
      };
    }),
    y,
  );
}

/** The practitioner's findings, plan and follow-up date. */
function practitionerSection(doc: PDFKit.PDFDocument, input: ReportInput, y: number): number {
  const width = contentWidth(doc);
  y = heading(doc, "Practitioner's findings", y);
  doc
    .font(FONT.body)
    .fontSize(9)
    .fillColor(INK)
    .text(input.findings?.trim() || 'No findings written.', MARGIN, y, { width });
  y = heading(doc, 'Plan', doc.y + 10);
  doc
    .font(FONT.body)
    .fontSize(9)
    .fillColor(INK)
    .text(input.plan?.trim() || 'No plan written.', MARGIN, y, { width });
  doc
    .font(FONT.strong)
    .fontSize(9)
    .text(`Follow-up: ${input.followUpDate ?? 'not set'}`, MARGIN, doc.y + 6);
  return doc.y + 12;
}

/** The numbered sources the ranges cite. */
function sourcesList(doc: PDFKit.PDFDocument, sources: string[], y: number): number {
  const width = contentWidth(doc);
  y = heading(doc, 'Sources of the reference ranges', y);
  sources.forEach((s, i) => {
    doc
      .font(FONT.body)
      .fontSize(7)
      .fillColor(MUTED)
      .text(`[${i + 1}] ${s}`, MARGIN, y, { width });
    y = doc.y + 2;
  });
  return y + 8;
}

/** The caution and page number at the foot of every page, once all pages exist. */
function pageFooters(doc: PDFKit.PDFDocument, generatedAt: string): void {
  const width = contentWidth(doc);
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const bottom = doc.page.height - 28;
    doc.font(FONT.body).fontSize(6.5).fillColor(MUTED);
    doc.text(
      `Not a diagnosis. Anything that calls for it reads "${pleaseSeeClinician}". Generated ${generatedAt}. Page ${i + 1} of ${range.count}.`,
      MARGIN,
      bottom,
      { width, align: 'center', lineBreak: false, height: 10 },
    );
  }
}

export function renderReportPdf(input: ReportInput): Promise<Buffer> {
  const { doc, done } = openDocument(input);
  let y = letterhead(doc, input);
  y = visitFacts(doc, input, y);
  y = cautionBox(doc, y + 6);
  y = referralBox(doc, input.referral, y);
  y = sitesSection(doc, input.sites, y);
  y = measurementsTable(doc, input.sites, y);
  y = outsideRangeList(doc, input.sites, y);
  if (input.comparison) y = comparisonTable(doc, input.comparison, input.sites, y);
  y = practitionerSection(doc, input, y);
  if (input.sources.length) y = sourcesList(doc, input.sources, y);
  cautionBox(doc, y);
  pageFooters(doc, input.generatedAt);
  doc.end();
  return done;
}
