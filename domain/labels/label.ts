// Label content and drawing: the clear text of a coil label (coil id, size/SDR, material,
// lot, the ASTM F2897 code as text, length, and QUARANTINED in words when it is) and of a joint tag (joint number, job, date), the address the QR opens, and
// an SVG of one label in mm (QR on the left, text on the right). The QR module matrix is
// passed in (made by the qrcode package at the edge), so this stays pure.
// QR quiet zone of 4 modules: ISO/IEC 18004 §7.3.8 (from memory, unconfirmed).

import { formatQuantity, type UnitSystem } from '@/domain/units/format';

export const QR_QUIET_ZONE_MODULES = 4;

/** Address a coil label's QR opens: `<base>/coils/<coil id>` (base without a trailing slash). */
export function coilLabelUrl(baseUrl: string, coilCode: string): string {
  return `${baseUrl.replace(/\/+$/, '')}/coils/${encodeURIComponent(coilCode)}`;
}

/** Address a joint tag's QR opens: `<base>/joints/<joint id>`. */
export function jointLabelUrl(baseUrl: string, jointId: number): string {
  return `${baseUrl.replace(/\/+$/, '')}/joints/${jointId}`;
}

export interface LabelText {
  /** The big first line (coil id, joint number). */
  title: string;
  lines: string[];
  /** Short text for file names and alt text. */
  name: string;
  /** Index of the line drawn as a warning: bold, white on a black band, so it reads in words without colour. */
  warningLine?: number;
  /** Indexes of lines set in a monospaced face (a code, where 0/O and l/1 must be told apart). */
  monoLines?: number[];
}

/** The warning a quarantined coil's label carries (words, not colour: it prints on a monochrome printer). */
export const QUARANTINED_LABEL_WARNING = 'QUARANTINED: DO NOT USE';

const SERIES_LABEL = { ips: 'IPS', cts: 'CTS', metric: 'mm' } as const;

/** Size as people say it: 2" IPS SDR 11, 63 mm SDR 11. */
export function describeSize(coil: { series: 'ips' | 'cts' | 'metric'; nominalSize: string; sdr: number }): string {
  const nominal = coil.series === 'metric' ? `${coil.nominalSize} mm` : `${coil.nominalSize.replace('-', ' ')}" ${SERIES_LABEL[coil.series]}`;
  return `${nominal} SDR ${Number(coil.sdr.toFixed(2))}`;
}

/**
 * Clear text of a coil label: coil id; "QUARANTINED: DO NOT USE" first when the coil is
 * quarantined; size and SDR; material; manufacturer and lot; the ASTM F2897 code as text
 * ("F2897 QFiAE97D0H123Kj0", monospaced, so it can be read and typed when a barcode will not
 * scan and 0/O, l/1 are told apart); the
 * coil's full length in the label's unit system (m, or ft for US crews), e.g.
 * "Length 152.4 m" / "Length 500 ft".
 */
export function coilLabelText(
  coil: { coilCode: string; series: 'ips' | 'cts' | 'metric'; nominalSize: string; sdr: number; material: string; manufacturer: string; lot: string; lengthM: number; traceCode?: string | null; status?: string },
  system: UnitSystem = 'si',
): LabelText {
  const quarantined = coil.status === 'quarantined';
  const lines = [
    ...(quarantined ? [QUARANTINED_LABEL_WARNING] : []),
    describeSize(coil),
    coil.material,
    `${coil.manufacturer}`,
    `Lot ${coil.lot}`,
    ...(coil.traceCode ? [`F2897 ${coil.traceCode}`] : []),
    `Length ${formatQuantity(coil.lengthM, 'length-m', system)}`,
  ];
  return {
    title: coil.coilCode,
    lines,
    name: `coil-${coil.coilCode}`,
    ...(quarantined ? { warningLine: 0 } : {}),
    ...(coil.traceCode ? { monoLines: [lines.length - 2] } : {}),
  };
}

/** Clear text of a joint tag: "Joint 12", job code and name, date made (YYYY-MM-DD). */
export function jointLabelText(joint: { id: number; jointNo: number; jobCode: string; jobName?: string | null; madeOn: string; station?: string | null }): LabelText {
  const lines = [joint.jobCode, ...(joint.jobName ? [joint.jobName] : []), `Made ${joint.madeOn}`, ...(joint.station ? [`Station ${joint.station}`] : [])];
  return { title: `Joint ${joint.jointNo}`, lines, name: `joint-${joint.jobCode}-${joint.jointNo}` };
}

/** A QR symbol as a square matrix of dark (1/true) and light modules, row by row. */
export interface QrMatrix {
  size: number;
  data: ArrayLike<number | boolean>;
}

function escapeXml(text: string): string {
  return text.replace(/[<>&"']/g, (c) => ({ '<': '&lt;', '>': '&gt;', '&': '&amp;', '"': '&quot;', "'": '&apos;' })[c] as string);
}

/** One SVG path of the dark modules (one rect-like subpath per horizontal run), in module units. */
export function qrPath(qr: QrMatrix): string {
  const parts: string[] = [];
  for (let row = 0; row < qr.size; row += 1) {
    let col = 0;
    while (col < qr.size) {
      if (!qr.data[row * qr.size + col]) {
        col += 1;
        continue;
      }
      const start = col;
      while (col < qr.size && qr.data[row * qr.size + col]) col += 1;
      parts.push(`M${start} ${row}h${col - start}v1h${start - col}z`);
    }
  }
  return parts.join('');
}

/** Average advance width of the label font (DejaVu/Liberation Sans), in em; generous for capitals and digits. */
const CHAR_WIDTH_EM = 0.6;

export interface LabelGeometry {
  qrX: number;
  qrY: number;
  qrSide: number;
  textX: number;
  textWidth: number;
  titleSize: number;
  lineSize: number;
  lineYs: number[];
  titleY: number;
}

/**
 * Where the QR and the text go on a label of w × h mm: the QR (with its quiet zone) is a
 * square of the label's height less padding, at least 40 % of the width when the label is
 * tall; the text fills the rest, with font sizes that fit the longest line.
 */
export function labelGeometry(widthMm: number, heightMm: number, text: LabelText): LabelGeometry {
  const pad = Math.max(1, Math.min(widthMm, heightMm) * 0.04);
  const qrSide = Math.min(heightMm - 2 * pad, widthMm * 0.5);
  const qrX = pad;
  const qrY = (heightMm - qrSide) / 2;
  const textX = qrX + qrSide + pad;
  const textWidth = Math.max(5, widthMm - textX - pad);
  const lineCount = text.lines.length;
  const available = heightMm - 2 * pad;
  // Title is 1.5 × a line; line height 1.2 em.
  const byHeight = available / ((1.5 + lineCount) * 1.2);
  const longest = Math.max(...text.lines.map((line) => line.length), 1);
  const byWidth = textWidth / (longest * CHAR_WIDTH_EM);
  const lineSize = Math.max(1, Math.min(byHeight, byWidth, 6));
  const titleSize = Math.max(1, Math.min(lineSize * 1.5, textWidth / (Math.max(text.title.length, 1) * CHAR_WIDTH_EM)));
  const blockHeight = titleSize * 1.2 + lineCount * lineSize * 1.2;
  const top = (heightMm - blockHeight) / 2;
  const titleY = top + titleSize;
  const lineYs = text.lines.map((_, i) => top + titleSize * 1.2 + lineSize * (i + 1) * 1.2 - lineSize * 0.2);
  return { qrX, qrY, qrSide, textX, textWidth, titleSize, lineSize, lineYs, titleY };
}

/**
 * The SVG of one label, w × h mm (viewBox in mm): white background, the QR with its quiet
 * zone, the title in bold and the clear-text lines. `url` is written as the QR's title for
 * screen readers and checks.
 */
export function renderLabelSvg(input: { widthMm: number; heightMm: number; qr: QrMatrix; text: LabelText; url: string; standalone?: boolean }): string {
  const { widthMm: w, heightMm: h, qr, text } = input;
  const g = labelGeometry(w, h, text);
  const modules = qr.size + 2 * QR_QUIET_ZONE_MODULES;
  const scale = g.qrSide / modules;
  const round = (n: number) => Number(n.toFixed(3));
  const font = "font-family=\"DejaVu Sans, Liberation Sans, Arial, Helvetica, sans-serif\"";
  const mono = "font-family=\"DejaVu Sans Mono, Liberation Mono, Courier New, monospace\"";
  const isWarning = (i: number) => text.warningLine === i;
  const head = input.standalone === false ? '' : '<?xml version="1.0" encoding="UTF-8"?>\n';
  return (
    `${head}<svg xmlns="http://www.w3.org/2000/svg" width="${round(w)}mm" height="${round(h)}mm" viewBox="0 0 ${round(w)} ${round(h)}" role="img" aria-label="${escapeXml(`${text.title}: ${text.lines.join(', ')}`)}">` +
    `<rect width="${round(w)}" height="${round(h)}" fill="#fff"/>` +
    (text.warningLine !== undefined ? `<rect x="0.5" y="0.5" width="${round(w - 1)}" height="${round(h - 1)}" fill="none" stroke="#000" stroke-width="1"/>` : '') +
    `<g transform="translate(${round(g.qrX + QR_QUIET_ZONE_MODULES * scale)} ${round(g.qrY + QR_QUIET_ZONE_MODULES * scale)}) scale(${Number(scale.toFixed(5))})">` +
    `<title>${escapeXml(input.url)}</title><path d="${qrPath(qr)}" fill="#000" shape-rendering="crispEdges"/></g>` +
    `<text x="${round(g.textX)}" y="${round(g.titleY)}" ${font} font-size="${round(g.titleSize)}" font-weight="700" fill="#000">${escapeXml(text.title)}</text>` +
    text.lines
      .map((line, i) => {
        const y = g.lineYs[i] as number;
        const face = text.monoLines?.includes(i) ? mono : font;
        if (!isWarning(i)) return `<text x="${round(g.textX)}" y="${round(y)}" ${face} font-size="${round(g.lineSize)}" fill="#000">${escapeXml(line)}</text>`;
        // White bold words on a black band: the warning survives a monochrome printer and a glance.
        return (
          `<rect x="${round(g.textX - 0.5)}" y="${round(y - g.lineSize * 0.95)}" width="${round(g.textWidth + 0.5)}" height="${round(g.lineSize * 1.2)}" fill="#000"/>` +
          `<text x="${round(g.textX)}" y="${round(y)}" ${face} font-size="${round(g.lineSize)}" font-weight="700" fill="#fff">${escapeXml(line)}</text>`
        );
      })
      .join('') +
    `</svg>`
  );
}
