import PDFDocument from 'pdfkit';
import { existsSync, readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import type {
  Comment,
  DetectedShiftItem,
  Drilldown,
  PeerReport,
  PeerReportRow,
  ReportFlag,
  Signoff,
} from '@plumbline/contracts';
import { worstFlag } from './report-csv.ts';
import { teaRuleText } from '@plumbline/contracts';

/** What the monthly PDF shows; gathered by the export service. */
export type MonthlyReportData = {
  report: PeerReport;
  /** Drill-downs of the flagged rows (warning or action), in report order. */
  flagged: { row: PeerReportRow; drilldown: Drilldown }[];
  /** Flagged rows beyond the chart limit (listed, not charted). */
  flaggedNotCharted: number;
  comments: Comment[];
  signoff: Signoff | null;
  generatedAt: Date;
  /** Shifts of the lab's monthly SDI signalled in this period, with the events recorded before them. */
  shifts?: { procedureCode: string; shift: DetectedShiftItem }[];
};

export const REPORT_CAUTION =
  'Results support, and do not replace, the laboratory director’s judgement. Acceptance of QC runs, reference ' +
  'intervals and patient reporting remain the laboratory director’s responsibility under local regulation and ' +
  'accreditation. Reference intervals must be reviewed before clinical use.';

// ---- fonts -------------------------------------------------------------------------------------------

type Fonts = { regular: string; bold: string; unicode: boolean };

/**
 * Fira Sans (SIL Open Font License, the web app's typeface) from @fontsource when it is installed; its WOFF
 * files embed through pdfkit's font engine. Otherwise pdfkit's built-in Helvetica, which only knows the
 * WinAnsi characters, so text is then reduced to them.
 */
function registerFonts(doc: PDFKit.PDFDocument): Fonts {
  try {
    const require = createRequire(import.meta.url);
    const regular = require.resolve('@fontsource/fira-sans/files/fira-sans-latin-400-normal.woff');
    const bold = require.resolve('@fontsource/fira-sans/files/fira-sans-latin-600-normal.woff');
    if (existsSync(regular) && existsSync(bold)) {
      doc.registerFont('body', readFileSync(regular));
      doc.registerFont('body-bold', readFileSync(bold));
      return { regular: 'body', bold: 'body-bold', unicode: true };
    }
  } catch {
    // Not installed: fall back to the built-in font below.
  }
  return { regular: 'Helvetica', bold: 'Helvetica-Bold', unicode: false };
}

/** Stand-ins for characters a font lacks. */
const replacements: Record<string, string> = {
  '−': '-',
  '≤': '<=',
  '≥': '>=',
  '√': 'sqrt',
  σ: 'sigma',
  '’': "'",
  '‘': "'",
  '“': '"',
  '”': '"',
  '–': '-',
  '—': '-',
  '…': '...',
};

/** Code points in the Latin subset of Fira Sans that @fontsource ships (its unicode-range). */
function inFiraLatin(cp: number): boolean {
  return (
    cp <= 0xff ||
    (cp >= 0x2000 && cp <= 0x206f) ||
    [
      0x131, 0x152, 0x153, 0x2bb, 0x2bc, 0x2c6, 0x2da, 0x2dc, 0x304, 0x308, 0x329, 0x20ac, 0x2122, 0x2191,
      0x2193, 0x2212, 0x2215, 0xfeff, 0xfffd,
    ].includes(cp)
  );
}

/** Text reduced to what the font can draw: Fira's Latin subset, or WinAnsi (Latin-1 here) for Helvetica. */
function drawable(text: string, unicode: boolean): string {
  return [...text]
    .map((c) => {
      const cp = c.codePointAt(0)!;
      if (unicode ? inFiraLatin(cp) : cp <= 0xff) return c;
      return replacements[c] ?? '?';
    })
    .join('');
}

// ---- number formats ----------------------------------------------------------------------------------

/** A number with fixed decimals and a true minus sign; an em dash when missing. */
export function formatNumber(value: number | null | undefined, decimals: number): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  const text = value.toFixed(decimals);
  return text.startsWith('-') ? (/^-0(\.0+)?$/.test(text) ? text.slice(1) : `−${text.slice(1)}`) : text;
}

const severityColour: Record<ReportFlag['severity'], string> = {
  fine: '#4b5563',
  acceptable: '#4b5563',
  warning: '#a15c07',
  action: '#b42318',
};
const INK = '#1f2937';
const MUTED = '#6b7280';
const RULE = '#d1d5db';
const ACCENT = '#27496d';

const CHART_HEIGHT = 150;
/** A row's title, its charts and the gap after them. */
const CHART_BLOCK_HEIGHT = CHART_HEIGHT + 32;

const tierLabel = { instrument: 'instrument', method: 'method', analyte: 'analyte' } as const;

// ---- the document ------------------------------------------------------------------------------------

/** Renders the monthly report: A4 landscape, vector charts drawn with pdfkit primitives. */
export function renderMonthlyReportPdf(data: MonthlyReportData): Promise<Buffer> {
  const { report } = data;
  const doc = new PDFDocument({
    size: 'A4',
    layout: 'landscape',
    margin: 36,
    bufferPages: true,
    info: {
      Title: `Monthly peer comparison ${report.period} — ${report.lab.code}`,
      Author: 'Plumbline',
      Subject: `QC peer comparison of ${report.lab.code} for ${report.period}`,
    },
  });
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('data', (chunk: Buffer) => chunks.push(chunk));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  const fonts = registerFonts(doc);
  const clean = (text: string) => drawable(text, fonts.unicode);
  const left = doc.page.margins.left;
  const width = doc.page.width - doc.page.margins.left - doc.page.margins.right;
  const bottom = () => doc.page.height - doc.page.margins.bottom - 18;
  let y = doc.page.margins.top;

  const write = (
    text: string,
    x: number,
    at: number,
    options: PDFKit.Mixins.TextOptions & { size?: number; bold?: boolean; colour?: string } = {},
  ) => {
    const { size = 9, bold = false, colour = INK, ...rest } = options;
    doc
      .font(bold ? fonts.bold : fonts.regular)
      .fontSize(size)
      .fillColor(colour);
    doc.text(clean(text), x, at, { lineBreak: false, ...rest });
  };
  const heightOf = (text: string, w: number, size = 9, bold = false) => {
    doc.font(bold ? fonts.bold : fonts.regular).fontSize(size);
    return doc.heightOfString(clean(text), { width: w });
  };
  const newPage = () => {
    doc.addPage();
    y = doc.page.margins.top;
  };
  const ensure = (height: number) => {
    if (y + height > bottom()) newPage();
  };
  /** A section heading kept on the same page as the first `keepWith` points of its content. */
  const heading = (text: string, keepWith = 22) => {
    ensure(18 + keepWith);
    y += 8;
    write(text, left, y, { size: 12, bold: true, colour: ACCENT });
    y += 18;
  };
  const paragraph = (
    text: string,
    options: { size?: number; bold?: boolean; colour?: string; indent?: number } = {},
  ) => {
    const indent = options.indent ?? 0;
    const size = options.size ?? 9;
    const h = heightOf(text, width - indent, size, options.bold);
    ensure(h + 4);
    doc
      .font(options.bold ? fonts.bold : fonts.regular)
      .fontSize(size)
      .fillColor(options.colour ?? INK);
    doc.text(clean(text), left + indent, y, { width: width - indent });
    y += h + 4;
  };

  // Title block.
  write('Plumbline', left, y, { size: 9, bold: true, colour: ACCENT });
  y += 14;
  write(`Monthly peer comparison — ${report.period}`, left, y, { size: 18, bold: true });
  y += 26;
  write(`Laboratory ${report.lab.code} — ${report.lab.name}`, left, y, { size: 11 });
  y += 16;
  const figures = report.published
    ? `Peer figures: published version ${report.published.version} of ${report.published.publishedAt.slice(0, 10)}.`
    : 'Peer figures: provisional — the period is not published yet, so the figures may still change.';
  write(figures, left, y, {
    size: 9,
    colour: report.published ? INK : severityColour.warning,
    bold: !report.published,
  });
  y += 13;
  write(
    `Means and SDs in ${report.units === 'conventional' ? 'conventional' : 'SI'} units. Generated ${isoMinute(data.generatedAt)} UTC.`,
    left,
    y,
    { size: 8, colour: MUTED },
  );
  y += 16;

  // The report table.
  heading('Report');
  drawReportTable();

  // Flag explanations for the flagged rows.
  const flaggedRows = report.rows.filter((r) => {
    const worst = worstFlag(r.flags);
    return worst === 'warning' || worst === 'action';
  });
  if (flaggedRows.length > 0) {
    heading('Flags');
    for (const row of flaggedRows) {
      const relevant = row.flags.filter((f) => f.severity === 'warning' || f.severity === 'action');
      paragraph(
        `${rowLabel(row)}: ${relevant.map((f) => `${f.severity.toUpperCase()} — ${f.message}`).join(' ')}`,
        { size: 8.5 },
      );
    }
  }

  // Rows whose comparison cannot be computed, with the reason (the other rows are unaffected).
  const notComputable = report.rows.filter((r) => r.notComputable || r.cumulative.notComputable);
  if (notComputable.length > 0) {
    heading('Rows that cannot be computed');
    for (const row of notComputable) {
      const reasons = [
        row.notComputable && `this month: ${row.notComputable.reason}`,
        row.cumulative.notComputable && `lot to date: ${row.cumulative.notComputable.reason}`,
      ].filter(Boolean);
      paragraph(`${rowLabel(row)}: ${reasons.join(' ')}`, { size: 8.5 });
    }
  }

  // Shifts of the monthly SDI signalled this month (methods.md §8), with the events recorded before them.
  if (data.shifts && data.shifts.length > 0) {
    heading('Detected shifts');
    for (const { procedureCode, shift } of data.shifts) {
      const events = shift.events.map((e) => `${e.kind} on ${e.occurredOn}${e.note ? ` (${e.note})` : ''}`);
      paragraph(
        `${procedureCode} · lot ${shift.controlLot} · level ${shift.level}: SDI shifted ${shift.direction} by ` +
          `${Math.abs(shift.sizeSdi).toFixed(1)} from ${shift.period}. ` +
          (events.length > 0 ? `Recorded before it: ${events.join('; ')}.` : 'No event recorded before it.'),
        { size: 8.5 },
      );
    }
  }

  // Charts of the flagged rows.
  if (data.flagged.length > 0) {
    heading('Charts of the flagged rows', CHART_BLOCK_HEIGHT);
    for (const { row, drilldown } of data.flagged) drawRowCharts(row, drilldown);
    if (data.flaggedNotCharted > 0) {
      paragraph(
        `${data.flaggedNotCharted} further flagged row(s) are not charted here; open them in Plumbline.`,
        { colour: MUTED },
      );
    }
  }

  // Comments.
  heading('Comments');
  if (data.comments.length === 0) paragraph('No comments for this period.', { colour: MUTED });
  for (const c of data.comments) {
    paragraph(
      `${c.procedure.code} · ${c.analyte.name} · lot ${c.controlLot.lotNumber} · level ${c.level} — ${c.author.name}, ${isoMinute(new Date(c.createdAt))} UTC`,
      { size: 8, colour: MUTED, bold: true },
    );
    y -= 2;
    paragraph(c.body, { indent: 10 });
  }

  // Sign-off.
  heading('Sign-off');
  if (data.signoff) {
    paragraph(
      `Signed off by ${data.signoff.signedBy.name} on ${isoMinute(new Date(data.signoff.signedAt))} UTC.`,
      { bold: true },
    );
    paragraph(`Statement: ${data.signoff.statement}`);
  } else {
    paragraph('Not signed off: the supervisor has not signed this period yet.', {
      bold: true,
      colour: severityColour.warning,
    });
  }

  // Caution.
  const cautionHeight = heightOf(REPORT_CAUTION, width - 20, 9) + 24;
  ensure(cautionHeight + 10);
  y += 8;
  doc.rect(left, y, 3, cautionHeight).fill('#b08d57');
  write('Caution', left + 12, y + 4, { size: 9, bold: true });
  doc.font(fonts.regular).fontSize(9).fillColor(INK);
  doc.text(clean(REPORT_CAUTION), left + 12, y + 17, { width: width - 20 });
  y += cautionHeight;

  // Page footers (written with the bottom margin lifted, so pdfkit does not start a new page).
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const margin = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    write(
      `Plumbline · ${report.lab.code} · ${report.period} · ${report.published ? `published v${report.published.version}` : 'provisional'} · page ${i - range.start + 1} of ${range.count}`,
      left,
      doc.page.height - margin + 10,
      { size: 7, colour: MUTED, width, align: 'right' },
    );
    doc.page.margins.bottom = margin;
  }
  doc.end();
  return done;

  // ---- pieces ----------------------------------------------------------------------------------------

  function rowLabel(row: PeerReportRow) {
    return `${row.procedure.code} (${row.analyte.name}) · lot ${row.controlLot.lotNumber} · level ${row.level}`;
  }

  function drawReportTable() {
    type Column = {
      title: string;
      width: number;
      align?: 'left' | 'right';
      cell: (r: PeerReportRow) => string;
    };
    const columns: Column[] = [
      { title: 'Procedure', width: 58, cell: (r) => r.procedure.code },
      { title: 'Analyte', width: 78, cell: (r) => r.analyte.name },
      { title: 'Lot', width: 62, cell: (r) => r.controlLot.lotNumber },
      { title: 'Lvl', width: 22, align: 'right', cell: (r) => String(r.level) },
      { title: 'Unit', width: 44, cell: (r) => r.unit },
      { title: 'n', width: 26, align: 'right', cell: (r) => String(r.lab.n) },
      { title: 'Mean', width: 48, align: 'right', cell: (r) => formatNumber(r.lab.mean, r.decimals) },
      { title: 'SD', width: 44, align: 'right', cell: (r) => formatNumber(r.lab.sd, r.decimals + 1) },
      { title: 'CV %', width: 34, align: 'right', cell: (r) => formatNumber(r.lab.cv, 1) },
      {
        title: 'Peer',
        width: 58,
        cell: (r) => (r.peer ? `${tierLabel[r.peer.tier]}, ${r.peer.labs}` : 'none'),
      },
      { title: 'Peer mean', width: 50, align: 'right', cell: (r) => formatNumber(r.peer?.mean, r.decimals) },
      { title: 'Peer SD', width: 44, align: 'right', cell: (r) => formatNumber(r.peer?.sd, r.decimals + 1) },
      { title: 'SDI', width: 36, align: 'right', cell: (r) => formatNumber(r.sdi, 2) },
      { title: 'CVR', width: 34, align: 'right', cell: (r) => formatNumber(r.cvr, 2) },
      { title: 'Bias %', width: 38, align: 'right', cell: (r) => formatNumber(r.biasPct, 1) },
      { title: 'Sigma', width: 34, align: 'right', cell: (r) => formatNumber(r.sigma, 1) },
      {
        title: 'Flag',
        width: 0,
        cell: (r) => (r.notComputable ? 'cannot be computed' : (worstFlag(r.flags) ?? '—')),
      },
    ];
    const used = columns.reduce((sum, c) => sum + c.width, 0);
    columns[columns.length - 1].width = Math.max(40, width - used);
    const rowHeight = 14;

    const header = () => {
      ensure(rowHeight * 2);
      let x = left;
      doc.rect(left, y, width, rowHeight).fill('#eef2f6');
      for (const c of columns) {
        write(c.title, x + 2, y + 3.5, {
          size: 7.5,
          bold: true,
          width: c.width - 4,
          align: c.align ?? 'left',
          ellipsis: true,
        });
        x += c.width;
      }
      y += rowHeight;
    };

    if (report.rows.length === 0) {
      paragraph('The lab has no QC data for this period.', { colour: MUTED });
      return;
    }
    header();
    report.rows.forEach((r, index) => {
      if (y + rowHeight > bottom()) {
        newPage();
        header();
      }
      if (index % 2 === 1) doc.rect(left, y, width, rowHeight).fill('#f8fafc');
      const worst = worstFlag(r.flags);
      let x = left;
      for (const c of columns) {
        const isFlag = c.title === 'Flag';
        const alarming = worst === 'warning' || worst === 'action';
        write(c.cell(r), x + 2, y + 3.5, {
          size: 7.5,
          width: c.width - 4,
          align: c.align ?? 'left',
          ellipsis: true,
          bold: isFlag && alarming,
          colour: isFlag && worst ? severityColour[worst] : INK,
        });
        x += c.width;
      }
      y += rowHeight;
      doc
        .moveTo(left, y)
        .lineTo(left + width, y)
        .lineWidth(0.3)
        .strokeColor(RULE)
        .stroke();
    });
    y += 6;
    if (report.rows.some((r) => r.sigma !== null)) {
      const sources = [
        ...new Set(
          report.rows
            .filter((r) => r.analyte.teaSource)
            .map(
              (r) =>
                `${r.analyte.name}: TEa ${teaRuleText(r.analyte, r.canonicalUnit)} (${r.analyte.teaSource})`,
            ),
        ),
      ];
      paragraph(
        `Sigma = (TEa % − |bias %|) / CV %, with TEa evaluated at each level's peer mean. ${sources.join('; ')}.`,
        { size: 7.5, colour: MUTED },
      );
    }
    paragraph(
      'SDI = (lab mean − peer mean) / peer SD; CVR = lab CV / peer within-lab CV. Flags: |SDI| up to 1 fine, up to 2 acceptable, ' +
        'up to 3 warning, above 3 action; CVR up to 1 fine, up to 1.5 acceptable, up to 2 warning, above 2 action (thresholds are settings).',
      { size: 7.5, colour: MUTED },
    );
  }

  function drawRowCharts(row: PeerReportRow, d: Drilldown) {
    const chartHeight = CHART_HEIGHT;
    const hasChart = d.leveyJennings.points.length > 0;
    ensure(CHART_BLOCK_HEIGHT);
    write(rowLabel(row), left, y, { size: 9, bold: true });
    y += 14;
    const chartWidth = hasChart ? (width - 20) / 2 : width / 2;
    drawSdiTrend(d, left, y, chartWidth, chartHeight);
    if (hasChart) drawLeveyJennings(d, left + chartWidth + 20, y, chartWidth, chartHeight);
    else
      write('No daily values this period: no control chart.', left + chartWidth + 20, y + 20, {
        size: 8,
        colour: MUTED,
      });
    y += chartHeight + 18;
  }

  /** Horizontal guide lines of a chart in SD units (0, ±1, ±2, ±3). */
  function guides(x: number, plotWidth: number, yOf: (v: number) => number, label: (k: number) => string) {
    for (const k of [-3, -2, -1, 0, 1, 2, 3]) {
      const gy = yOf(k);
      const colour =
        Math.abs(k) === 3
          ? severityColour.action
          : Math.abs(k) === 2
            ? severityColour.warning
            : k === 0
              ? INK
              : RULE;
      doc.save();
      if (k !== 0) doc.dash(Math.abs(k) === 1 ? 1 : 3, { space: 2 });
      doc
        .moveTo(x, gy)
        .lineTo(x + plotWidth, gy)
        .lineWidth(k === 0 ? 0.8 : 0.5)
        .strokeColor(colour)
        .stroke();
      doc.restore();
      write(label(k), x - 44, gy - 3, { size: 6, colour: MUTED, width: 40, align: 'right' });
    }
  }

  function drawSdiTrend(d: Drilldown, x0: number, y0: number, w: number, h: number) {
    write(`SDI over the last ${d.trend.length} period(s)`, x0, y0, { size: 8, bold: true, colour: ACCENT });
    const plotLeft = x0 + 46;
    const plotTop = y0 + 14;
    const plotWidth = w - 52;
    const plotHeight = h - 34;
    const values = d.trend.map((t) => t.sdi).filter((v): v is number => v !== null);
    const span = Math.max(3.5, ...values.map((v) => Math.abs(v) + 0.5));
    const yOf = (v: number) => plotTop + plotHeight / 2 - (v / span) * (plotHeight / 2);
    const step = d.trend.length > 1 ? plotWidth / (d.trend.length - 1) : 0;
    const xOf = (i: number) => (d.trend.length > 1 ? plotLeft + i * step : plotLeft + plotWidth / 2);
    doc.rect(plotLeft, plotTop, plotWidth, plotHeight).lineWidth(0.4).strokeColor(RULE).stroke();
    guides(plotLeft, plotWidth, yOf, (k) => (k === 0 ? '0' : k > 0 ? `+${k}` : `−${-k}`));

    // The line joins consecutive periods that have an SDI.
    let previous: [number, number] | null = null;
    d.trend.forEach((t, i) => {
      if (t.sdi === null) {
        previous = null;
        return;
      }
      const point: [number, number] = [xOf(i), yOf(t.sdi)];
      if (previous)
        doc
          .moveTo(previous[0], previous[1])
          .lineTo(point[0], point[1])
          .lineWidth(1)
          .strokeColor(ACCENT)
          .stroke();
      previous = point;
    });
    d.trend.forEach((t, i) => {
      const px = xOf(i);
      if (t.sdi !== null) {
        const py = yOf(t.sdi);
        const colour =
          Math.abs(t.sdi) > 3 ? severityColour.action : Math.abs(t.sdi) > 2 ? severityColour.warning : ACCENT;
        doc.circle(px, py, t.period === d.period ? 3 : 2).fill(colour);
        write(formatNumber(t.sdi, 2), px - 15, py - 10, { size: 6, width: 30, align: 'center', colour });
      }
      write(t.period, px - 16, plotTop + plotHeight + 4, {
        size: 5.5,
        width: 32,
        align: 'center',
        colour: MUTED,
      });
    });
  }

  function drawLeveyJennings(d: Drilldown, x0: number, y0: number, w: number, h: number) {
    const lj = d.leveyJennings;
    const target = lj.target!;
    const basis = {
      established: 'lab, earlier periods',
      'this-period': 'lab, this period',
      'peer-to-date': 'peer, lot to date',
      'peer-period': 'peer, this period',
    }[target.basis];
    write(
      `Control chart, ${d.period} (target ${basis}: mean ${formatNumber(target.mean, d.decimals)}, SD ${formatNumber(target.sd, d.decimals + 1)} ${d.unit})`,
      x0,
      y0,
      { size: 8, bold: true, colour: ACCENT, width: w, ellipsis: true },
    );
    const plotLeft = x0 + 46;
    const plotTop = y0 + 14;
    const plotWidth = w - 52;
    const plotHeight = h - 34;
    const span = Math.max(3.5, ...lj.points.map((p) => Math.abs(p.z) + 0.5));
    const yOf = (z: number) => plotTop + plotHeight / 2 - (z / span) * (plotHeight / 2);
    const n = lj.points.length;
    const xOf = (i: number) => (n > 1 ? plotLeft + (i * plotWidth) / (n - 1) : plotLeft + plotWidth / 2);
    doc.rect(plotLeft, plotTop, plotWidth, plotHeight).lineWidth(0.4).strokeColor(RULE).stroke();
    guides(plotLeft, plotWidth, yOf, (k) =>
      k === 0
        ? formatNumber(target.mean, d.decimals)
        : `${k > 0 ? '+' : '−'}${Math.abs(k)}s ${formatNumber(target.mean + k * target.sd, d.decimals)}`,
    );
    for (let i = 1; i < n; i++) {
      doc
        .moveTo(xOf(i - 1), yOf(lj.points[i - 1].z))
        .lineTo(xOf(i), yOf(lj.points[i].z))
        .lineWidth(0.7)
        .strokeColor(ACCENT)
        .stroke();
    }
    lj.points.forEach((p, i) => {
      const px = xOf(i);
      const py = yOf(p.z);
      const rejected = p.rules.some((r) => r !== '1-2s');
      if (p.rules.length === 0) {
        doc.circle(px, py, 1.8).fill(ACCENT);
        return;
      }
      const colour = rejected ? severityColour.action : severityColour.warning;
      doc.circle(px, py, 3).lineWidth(1).strokeColor(colour).stroke();
      doc.circle(px, py, 1.5).fill(colour);
      // Label the rejection rules (1-2s is only a warning and would crowd the chart when a rule rejects).
      const label = rejected ? p.rules.filter((r) => r !== '1-2s').join(' ') : '1-2s';
      write(label, px - 25, py + (p.z >= 0 ? -11 : 5), { size: 5.5, width: 50, align: 'center', colour });
    });
    const first = lj.points[0]?.measuredAt.slice(0, 10) ?? '';
    const last = lj.points.at(-1)?.measuredAt.slice(0, 10) ?? '';
    write(first, plotLeft, plotTop + plotHeight + 4, { size: 5.5, colour: MUTED });
    write(last, plotLeft + plotWidth - 40, plotTop + plotHeight + 4, {
      size: 5.5,
      colour: MUTED,
      width: 40,
      align: 'right',
    });
    const rejectedRuns = lj.runs.filter((r) => r.verdict === 'reject').length;
    write(
      `${n} values, ${lj.runs.length} runs, ${rejectedRuns} rejected`,
      plotLeft + plotWidth / 2 - 60,
      plotTop + plotHeight + 12,
      {
        size: 5.5,
        colour: MUTED,
        width: 120,
        align: 'center',
      },
    );
  }
}

function isoMinute(date: Date): string {
  return date.toISOString().slice(0, 16).replace('T', ' ');
}
