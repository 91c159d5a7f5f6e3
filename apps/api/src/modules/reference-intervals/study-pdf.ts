import PDFDocument from 'pdfkit';
import type { PartitionResult, StudyDetail, StudyResult } from '@plumbline/contracts';

const INK = '#1f2937';
const MUTED = '#6b7280';
const BAR = '#27496d';
const LIMIT = '#b42318';
const BAND = '#f3d9a4';

/** Helvetica draws only Latin-1: other characters get a plain stand-in. */
const plain = (text: string) =>
  text
    .replace(/[–—]/g, '-')
    .replace(/−/g, '-')
    .replace(/≤/g, '<=')
    .replace(/≥/g, '>=')
    .replace(/[’‘]/g, "'")
    .replace(/[“”]/g, '"')
    .replace(/[^\x20-\xff\n]/g, '?');

const fmt = (v: number | undefined) =>
  v === undefined ? '-' : Math.abs(v) >= 100 ? v.toFixed(1) : v.toPrecision(3);
const limitText = (l: PartitionResult['lower']) =>
  l ? `${fmt(l.value)}${l.ci ? ` (90 % CI ${fmt(l.ci[0])} to ${fmt(l.ci[1])})` : ''}` : 'none';

/**
 * A study result as a PDF (A4 portrait, pdfkit as for the monthly report): per partition the limits,
 * CIs, method, notes, the interval in use and a histogram with the limits and CI bands; then the
 * partition advice, the approval and the caution.
 */
export function renderStudyPdf(study: StudyDetail, result: StudyResult, caution: string): Promise<Buffer> {
  const doc = new PDFDocument({
    size: 'A4',
    margin: 40,
    info: { Title: plain(`${study.name}, version ${result.version}`), Author: 'Plumbline' },
  });
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('data', (chunk: Buffer) => chunks.push(chunk));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  const text = (t: string, options: PDFKit.Mixins.TextOptions = {}) => doc.text(plain(t), options);

  doc.font('Helvetica-Bold').fontSize(16).fillColor(INK);
  text(`${study.name} - version ${result.version}`);
  doc.font('Helvetica').fontSize(10).fillColor(MUTED);
  text(
    `${study.analyte.name} (${result.unit}); ages ${study.selection.ageLow}-${study.selection.ageHigh}; ` +
      `method ${study.method}; outlier screening ${study.screening}; computed ${result.computedAt.slice(0, 16).replace('T', ' ')} UTC`,
  );
  doc.moveDown(0.5).fillColor(LIMIT).font('Helvetica-Bold');
  text(`Caution: ${caution}`);
  doc.moveDown();

  for (const p of result.partitions) {
    if (doc.y > 600) doc.addPage();
    doc.font('Helvetica-Bold').fontSize(12).fillColor(INK);
    text(p.label);
    doc.font('Helvetica').fontSize(10);
    text(`n = ${p.n}; excluded as outliers: ${p.excludedCount}; method: ${p.method}`);
    text(`Lower limit: ${limitText(p.lower)} ${result.unit}`);
    text(`Upper limit: ${limitText(p.upper)} ${result.unit}`);
    text(
      `In use today: ${p.current ? `${p.current.lower} to ${p.current.upper} ${result.unit} (${p.current.source})` : 'none entered'}`,
    );
    if (p.note) text(p.note);
    drawHistogram(doc, p);
    doc.moveDown();
  }
  if (result.advice.length) {
    doc.font('Helvetica-Bold').fontSize(12);
    text('Partition advice');
    doc.font('Helvetica').fontSize(10);
    for (const a of result.advice) text(a.advice);
    doc.moveDown();
  }
  doc.font('Helvetica-Bold').fontSize(12);
  text('Approval');
  doc.font('Helvetica').fontSize(10);
  text(
    result.approval
      ? `Approved by ${result.approval.approvedBy} on ${result.approval.approvedAt.slice(0, 10)}: "${result.approval.statement}"`
      : 'Not approved.',
  );
  doc.end();
  return done;
}

function drawHistogram(doc: PDFKit.PDFDocument, p: PartitionResult) {
  const bins = p.histogram;
  if (!bins.length) return;
  const left = 60;
  const width = 460;
  const height = 110;
  const top = doc.y + 8;
  const limits = [p.lower, p.upper].filter((l) => l !== null);
  const lo = Math.min(bins[0].from, ...limits.map((l) => l.ci?.[0] ?? l.value));
  const hi = Math.max(bins[bins.length - 1].to, ...limits.map((l) => l.ci?.[1] ?? l.value));
  const x = (v: number) => left + ((v - lo) / (hi - lo || 1)) * width;
  const maxCount = Math.max(...bins.map((b) => b.count));
  for (const l of limits)
    if (l.ci) doc.rect(x(l.ci[0]), top, Math.max(1, x(l.ci[1]) - x(l.ci[0])), height).fill(BAND);
  for (const b of bins) {
    const h = (b.count / maxCount) * height;
    doc.rect(x(b.from), top + height - h, Math.max(0.5, x(b.to) - x(b.from) - 0.5), h).fill(BAR);
  }
  for (const l of limits)
    doc
      .moveTo(x(l.value), top)
      .lineTo(x(l.value), top + height)
      .lineWidth(1.5)
      .stroke(LIMIT);
  doc.fillColor(MUTED).fontSize(8);
  doc.text(fmt(lo), left - 10, top + height + 3, { lineBreak: false });
  doc.text(fmt(hi), left + width - 10, top + height + 3, { lineBreak: false });
  doc.fillColor(INK).fontSize(10);
  doc.x = 40;
  doc.y = top + height + 16;
}
