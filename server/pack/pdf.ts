import PDFDocument from 'pdfkit';
import { type Chart, inkColors, type Shape } from '@shared/pack/charts';
import { fontBytes, type FontName, textRuns } from './fonts';
import { type Block, type PackInput, type PackTable, packSections } from './sections';

/**
 * The committee pack as a PDF, made on the server with pdfkit (no browser): A4 portrait pages;
 * a table too wide for a portrait page goes on landscape pages, and one too wide even for those is
 * split by columns with its first column repeated. A column is never narrower than its longest
 * word, so nothing wraps a letter per line; rows never split, and a table's header repeats on each
 * page. Charts are drawn as vectors from shared/pack/charts.ts. Deterministic: the same input gives
 * the same bytes (fixed document dates and id), so a stored pack's SHA-256 can be checked.
 */

const MARGIN = 48;
const BODY = 9;
const SMALL = 7.5;
const CELL_PAD = 4;
const LINE = 1.25;

type Doc = PDFKit.PDFDocument;

const widths = new WeakMap<Doc, Map<string, number>>();

/** The width of one line of text at `size` points (runs of both faces), cached per document. */
function measure(doc: Doc, text: string, size: number, bold = false): number {
  let cache = widths.get(doc);
  if (!cache) widths.set(doc, (cache = new Map()));
  const key = `${bold ? 'b' : 'r'}${size}|${text}`;
  let width = cache.get(key);
  if (width === undefined) {
    width = 0;
    for (const run of textRuns(text, bold)) width += doc.font(run.font).fontSize(size).widthOfString(run.text);
    cache.set(key, width);
  }
  return width;
}

/** Draws one line of text (no wrapping) at x, y (top of the line box). */
function drawLine(doc: Doc, text: string, x: number, y: number, size: number, options: { bold?: boolean; color?: string; baseline?: boolean } = {}): void {
  let at = x;
  doc.fillColor(options.color ?? inkColors.text);
  for (const run of textRuns(text, options.bold ?? false)) {
    doc.font(run.font as FontName).fontSize(size);
    doc.text(run.text, at, y, { lineBreak: false, ...(options.baseline ? { baseline: 'alphabetic' } : {}) });
    at += doc.widthOfString(run.text);
  }
}

/** Word-wraps text into lines of at most `width`; a word longer than the width is cut by characters. */
function wrap(doc: Doc, text: string, width: number, size: number, bold = false): string[] {
  const lines: string[] = [];
  for (const paragraph of text.split('\n')) {
    let line = '';
    let used = 0;
    const space = measure(doc, ' ', size, bold);
    for (const word of paragraph.split(/ +/)) {
      const wordWidth = measure(doc, word, size, bold);
      if (!line || used + space + wordWidth <= width) {
        used = line ? used + space + wordWidth : wordWidth;
        line = line ? `${line} ${word}` : word;
      } else {
        lines.push(line);
        line = word;
        used = wordWidth;
      }
      while (used > width && line.length > 1) {
        let cut = line.length - 1;
        while (cut > 1 && measure(doc, line.slice(0, cut), size, bold) > width) cut--;
        lines.push(line.slice(0, cut));
        line = line.slice(cut);
        used = measure(doc, line, size, bold);
      }
    }
    lines.push(line);
  }
  return lines;
}

class Layout {
  y = MARGIN;
  landscape = false;
  constructor(readonly doc: Doc) {}
  get width(): number {
    return this.doc.page.width - 2 * MARGIN;
  }
  get bottom(): number {
    return this.doc.page.height - MARGIN;
  }
  newPage(landscape = this.landscape): void {
    this.landscape = landscape;
    this.doc.addPage({ size: 'A4', layout: landscape ? 'landscape' : 'portrait', margin: MARGIN });
    this.y = MARGIN;
  }
  ensure(height: number, landscape = this.landscape): void {
    if (landscape !== this.landscape || this.y + height > this.bottom) this.newPage(landscape);
  }
  paragraph(text: string, size = BODY, options: { bold?: boolean; color?: string } = {}): void {
    const lines = wrap(this.doc, text, this.width, size, options.bold);
    for (const line of lines) {
      this.ensure(size * LINE);
      drawLine(this.doc, line, MARGIN, this.y, size, options);
      this.y += size * LINE;
    }
    this.y += size * 0.5;
  }
}

function facts(layout: Layout, rows: [string, string][]): void {
  const doc = layout.doc;
  const labelWidth = Math.min(150, Math.max(...rows.map(([label]) => measure(doc, label, BODY))) + 12);
  for (const [label, value] of rows) {
    const lines = wrap(doc, value, layout.width - labelWidth, BODY);
    layout.ensure(lines.length * BODY * LINE);
    drawLine(doc, label, MARGIN, layout.y, BODY, { color: inkColors.muted });
    lines.forEach((line, index) => drawLine(doc, line, MARGIN + labelWidth, layout.y + index * BODY * LINE, BODY));
    layout.y += lines.length * BODY * LINE + 1;
  }
  layout.y += 6;
}

/** The narrowest a column may be (its longest word) and the width it would like (its longest cell on one line). */
function columnWidths(doc: Doc, table: PackTable, column: number): { min: number; ideal: number } {
  const cells = [table.head[column] ?? '', ...table.rows.map((row) => row[column] ?? '')];
  let min = 0;
  let ideal = 0;
  const numeric = table.numeric.includes(column);
  cells.forEach((cell, index) => {
    const bold = index === 0;
    const full = measure(doc, cell, SMALL, bold);
    ideal = Math.max(ideal, Math.min(full, 260));
    // Numbers stay on one line; text may wrap between words (a header always may).
    const longestWord = numeric && index > 0 ? full : Math.max(0, ...cell.split(/ +/).map((word) => measure(doc, word, SMALL, bold)));
    min = Math.max(min, longestWord);
  });
  return { min: min + 2 * CELL_PAD, ideal: ideal + 2 * CELL_PAD };
}

/** Splits the columns (after the first, which every part repeats) into parts that fit `width`. */
function columnParts(widths: { min: number }[], width: number): number[][] {
  const parts: number[][] = [];
  let current: number[] = [0];
  let used = widths[0].min;
  for (let column = 1; column < widths.length; column++) {
    if (used + widths[column].min > width && current.length > 1) {
      parts.push(current);
      current = [0];
      used = widths[0].min;
    }
    current.push(column);
    used += widths[column].min;
  }
  parts.push(current);
  return parts;
}

/** Widths for the given columns: each its minimum, the remaining room shared out towards the ideal. */
function allocate(widths: { min: number; ideal: number }[], columns: number[], width: number): number[] {
  const base = columns.map((column) => widths[column].min);
  const room = width - base.reduce((sum, value) => sum + value, 0);
  const wants = columns.map((column) => Math.max(0, widths[column].ideal - widths[column].min));
  const wanted = wants.reduce((sum, value) => sum + value, 0);
  if (room <= 0) return base;
  if (wanted <= room) return base.map((value, index) => value + wants[index] + (room - wanted) / columns.length);
  return base.map((value, index) => value + (room * wants[index]) / wanted);
}

function table(layout: Layout, spec: PackTable): void {
  const doc = layout.doc;
  const count = spec.head.length;
  const widths = Array.from({ length: count }, (_, column) => columnWidths(doc, spec, column));
  const needed = widths.reduce((sum, value) => sum + value.min, 0);
  const portrait = layout.landscape ? layout.doc.page.height - 2 * MARGIN : layout.width;
  const landscapeWidth = 842 - 2 * MARGIN;
  const landscape = needed > portrait;
  const available = landscape ? landscapeWidth : portrait;
  const parts = needed > available ? columnParts(widths, available) : [widths.map((_, column) => column)];
  parts.forEach((columns, partIndex) => {
    const title = parts.length > 1 ? `${spec.title} (columns, part ${partIndex + 1} of ${parts.length})` : spec.title;
    layout.ensure(BODY * 6, landscape);
    layout.paragraph(title, BODY, { bold: true });
    if (spec.note && partIndex === 0) layout.paragraph(spec.note, SMALL, { color: inkColors.muted });
    const columnWidth = allocate(widths, columns, available);
    const rowLines = (cells: string[], bold: boolean) => cells.map((cell, index) => (spec.numeric.includes(columns[index]) && !bold ? [cell] : wrap(doc, cell, columnWidth[index] - 2 * CELL_PAD, SMALL, bold)));
    const drawRow = (cells: string[], header: boolean) => {
      const lines = rowLines(cells, header);
      const height = Math.max(1, ...lines.map((cell) => cell.length)) * SMALL * LINE + 2 * CELL_PAD - 2;
      let x = MARGIN;
      if (header) doc.rect(MARGIN, layout.y, columnWidth.reduce((sum, w) => sum + w, 0), height).fill(inkColors.sunk);
      lines.forEach((cellLines, index) => {
        const numeric = spec.numeric.includes(columns[index]) && index > 0;
        cellLines.forEach((line, lineIndex) => {
          const lineWidth = measure(doc, line, SMALL, header || index === 0);
          const left = numeric ? x + columnWidth[index] - CELL_PAD - lineWidth : x + CELL_PAD;
          drawLine(doc, line, left, layout.y + CELL_PAD - 1 + lineIndex * SMALL * LINE, SMALL, { bold: header || index === 0, color: header ? inkColors.muted : inkColors.text });
        });
        x += columnWidth[index];
      });
      layout.y += height;
      doc
        .moveTo(MARGIN, layout.y)
        .lineTo(MARGIN + columnWidth.reduce((sum, w) => sum + w, 0), layout.y)
        .lineWidth(header ? 0.75 : 0.4)
        .strokeColor(header ? inkColors.axis : inkColors.grid)
        .stroke();
      return height;
    };
    const headCells = columns.map((column) => spec.head[column]);
    const headHeight = Math.max(1, ...rowLines(headCells, true).map((cell) => cell.length)) * SMALL * LINE + 2 * CELL_PAD;
    layout.ensure(headHeight * 2, landscape);
    drawRow(headCells, true);
    if (spec.rows.length === 0) layout.paragraph('None.', SMALL, { color: inkColors.muted });
    for (const row of spec.rows) {
      const cells = columns.map((column) => row[column] ?? '');
      const height = Math.max(1, ...rowLines(cells, false).map((cell) => cell.length)) * SMALL * LINE + 2 * CELL_PAD;
      if (layout.y + height > layout.bottom) {
        layout.newPage(landscape);
        drawRow(headCells, true);
      }
      drawRow(cells, false);
    }
    layout.y += 10;
  });
}

function dash(doc: Doc, style: 'solid' | 'dashed' | 'dotted'): void {
  if (style === 'dashed') doc.dash(5, { space: 3 });
  else if (style === 'dotted') doc.dash(1.5, { space: 2.5 });
  else doc.undash();
}

function shape(doc: Doc, item: Shape): void {
  switch (item.kind) {
    case 'line':
      dash(doc, item.dash);
      doc.moveTo(item.x1, item.y1).lineTo(item.x2, item.y2).lineWidth(item.width).strokeColor(inkColors[item.stroke]).stroke();
      doc.undash();
      return;
    case 'polyline': {
      dash(doc, item.dash);
      doc.moveTo(item.points[0][0], item.points[0][1]);
      for (const [x, y] of item.points.slice(1)) doc.lineTo(x, y);
      doc.lineWidth(item.width).lineJoin('round').strokeColor(inkColors[item.stroke]).stroke();
      doc.undash();
      return;
    }
    case 'rect':
      doc.rect(item.x, item.y, item.w, item.h);
      if (item.fill && item.stroke) doc.lineWidth(0.5).fillAndStroke(inkColors[item.fill], inkColors[item.stroke]);
      else if (item.fill) doc.fill(inkColors[item.fill]);
      else if (item.stroke) doc.lineWidth(0.5).stroke(inkColors[item.stroke]);
      return;
    case 'marker': {
      const s = item.size;
      if (item.shape === 'circle') doc.circle(item.x, item.y, s);
      else if (item.shape === 'triangle') doc.polygon([item.x, item.y - s * 1.15], [item.x + s, item.y + s * 0.75], [item.x - s, item.y + s * 0.75]);
      else doc.polygon([item.x, item.y - s * 1.2], [item.x + s, item.y], [item.x, item.y + s * 1.2], [item.x - s, item.y]);
      doc.fill(inkColors[item.fill]);
      return;
    }
    case 'text': {
      const width = measure(doc, item.text, item.size, item.bold);
      const x = item.anchor === 'middle' ? item.x - width / 2 : item.anchor === 'end' ? item.x - width : item.x;
      drawLine(doc, item.text, x, item.y, item.size, { bold: item.bold, color: inkColors[item.fill], baseline: true });
      return;
    }
  }
}

function chart(layout: Layout, spec: Chart): void {
  const doc = layout.doc;
  const scaleBy = Math.min(1.1, layout.width / spec.width);
  const height = spec.height * scaleBy;
  const captionLines = wrap(doc, spec.caption, layout.width, SMALL).length;
  layout.ensure(height + BODY * 2 + captionLines * SMALL * LINE + 8);
  layout.paragraph(spec.title, BODY, { bold: true });
  doc.save();
  doc.translate(MARGIN, layout.y);
  doc.scale(scaleBy);
  for (const item of spec.shapes) shape(doc, item);
  doc.restore();
  layout.y += height + 6;
  layout.paragraph(spec.caption, SMALL, { color: inkColors.muted });
  layout.y += 4;
}

function block(layout: Layout, item: Block): void {
  switch (item.kind) {
    case 'subheading':
      layout.ensure(BODY * 4);
      layout.y += 4;
      layout.paragraph(item.text, BODY + 1, { bold: true });
      return;
    case 'paragraph':
      layout.paragraph(item.text, BODY, { color: item.muted ? inkColors.muted : inkColors.text });
      return;
    case 'facts':
      facts(layout, item.rows);
      return;
    case 'table':
      table(layout, item);
      return;
    case 'chart':
      chart(layout, item.chart);
      return;
  }
}

/** Renders the pack to PDF bytes. */
export function renderPackPdf(input: PackInput): Promise<Buffer> {
  const created = new Date(input.generatedAt.getTime());
  const doc = new PDFDocument({
    size: 'A4',
    margin: MARGIN,
    autoFirstPage: false,
    bufferPages: true,
    info: {
      Title: `Committee pack: ${input.comparison.name}`,
      Author: 'Scorecourt',
      Subject: `Comparison ${input.comparison.id}`,
      Creator: 'Scorecourt',
      Producer: 'Scorecourt (pdfkit)',
      CreationDate: created,
      ModDate: created,
    },
  });
  for (const [name, bytes] of Object.entries(fontBytes())) doc.registerFont(name, bytes);
  const chunks: Buffer[] = [];
  doc.on('data', (chunk: Buffer) => chunks.push(chunk));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });

  const layout = new Layout(doc);
  for (const section of packSections) {
    const content = section(input);
    if (content === null) continue;
    layout.newPage(false);
    layout.paragraph(content.title, 14, { bold: true });
    doc.moveTo(MARGIN, layout.y - 4).lineTo(MARGIN + layout.width, layout.y - 4).lineWidth(1.2).strokeColor(inkColors.text).stroke();
    layout.y += 4;
    for (const item of content.blocks) block(layout, item);
  }
  // Page footers: the comparison, and page n of N.
  const range = doc.bufferedPageRange();
  for (let index = range.start; index < range.start + range.count; index++) {
    doc.switchToPage(index);
    const footerY = doc.page.height - MARGIN + 16;
    const bottomMargin = doc.page.margins.bottom;
    doc.page.margins.bottom = 0;
    drawLine(doc, `Scorecourt committee pack · comparison ${input.comparison.id}: ${input.comparison.name}`, MARGIN, footerY, SMALL, { color: inkColors.muted });
    const label = `page ${index + 1} of ${range.count}`;
    drawLine(doc, label, doc.page.width - MARGIN - measure(doc, label, SMALL), footerY, SMALL, { color: inkColors.muted });
    doc.page.margins.bottom = bottomMargin;
  }
  doc.end();
  return done;
}
