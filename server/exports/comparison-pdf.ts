import "server-only";
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import PDFDocument from "pdfkit";
import type { ComparisonColumnDto, ComparisonDto } from "@/server/comparisons/types";
import {
  columnTitle,
  comparisonCautions,
  comparisonTitle,
  formatDate,
  formatOutcomeValue,
  formatSpend,
  type Money,
  percentLevel,
  signoffSentence,
} from "./format";

// Palette (design notes): deep river, shallows bands, reed for signed off, ember for warnings.
const colors = {
  river: "#12404f",
  shallows: "#2a727b",
  pale: "#cfe5e7",
  mid: "#8fc1c6",
  reed: "#4f6d28",
  ember: "#b4452f",
  text: "#1f2a30",
  muted: "#55626b",
  rule: "#d9dee2",
} as const;

/**
 * Work Sans, the app's typeface, from @fontsource/work-sans. pdfkit (fontkit) embeds its WOFF files
 * (subset); the WOFF2 files fail fontkit's subsetter, so those are not used. Falls back to the
 * built-in Helvetica when the package files are not on disk.
 */
function fontFiles(): { regular: Buffer; bold: Buffer } | null {
  const directory = path.join(process.cwd(), "node_modules", "@fontsource", "work-sans", "files");
  const regular = path.join(directory, "work-sans-latin-400-normal.woff");
  const bold = path.join(directory, "work-sans-latin-600-normal.woff");
  if (!existsSync(regular) || !existsSync(bold)) return null;
  return { regular: readFileSync(regular), bold: readFileSync(bold) };
}

export type PdfContext = { money: Money; workspaceName: string; generatedBy: string; generatedAt?: Date };

/**
 * A one-page PDF of a comparison for finance (A4 landscape): per version its spend by channel and
 * total, the predicted outcome with both intervals (numbers and the band drawing), the difference
 * from the baseline with its own interval or why there is none, warnings, the fit and who approved
 * it, the sign-off status; and the cautions. Long text is cut with an ellipsis to keep one page.
 */
export async function comparisonPdf(comparison: ComparisonDto, context: PdfContext): Promise<Buffer> {
  const fonts = fontFiles();
  const doc = new PDFDocument({
    size: "A4",
    layout: "landscape",
    margins: { top: 30, bottom: 20, left: 32, right: 32 },
    info: { Title: `Side by side: ${comparisonTitle(comparison)}`, Author: context.generatedBy, Subject: "Scenario comparison for finance", Creator: "Tributary" },
    ...(fonts ? { font: fonts.regular as unknown as string } : {}),
  });
  const regular = fonts ? "WorkSans" : "Helvetica";
  const bold = fonts ? "WorkSans-SemiBold" : "Helvetica-Bold";
  if (fonts) {
    doc.registerFont(regular, fonts.regular);
    doc.registerFont(bold, fonts.bold);
  }
  const chunks: Buffer[] = [];
  doc.on("data", (chunk: Buffer) => chunks.push(chunk));
  const finished = new Promise<Buffer>((resolve, reject) => {
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
  });

  const { money } = context;
  const pageWidth = doc.page.width;
  const pageHeight = doc.page.height;
  const left = doc.page.margins.left;
  const right = pageWidth - doc.page.margins.right;
  const bottom = pageHeight - doc.page.margins.bottom;
  const labelWidth = 150;
  const columns = comparison.columns;
  const columnWidth = (right - left - labelWidth) / columns.length;
  const columnX = (index: number) => left + labelWidth + index * columnWidth;
  const inner = columnWidth - 10;
  const first = columns[0];
  const outcome = first.outcomeShape;

  // Title.
  doc.font(bold).fontSize(16).fillColor(colors.river).text(`Side by side: ${comparisonTitle(comparison)}`, left, 28, { width: right - left, lineBreak: false, ellipsis: true });
  const generatedAt = (context.generatedAt ?? new Date()).toISOString();
  doc
    .font(regular)
    .fontSize(8.5)
    .fillColor(colors.muted)
    .text(
      `${context.workspaceName} · generated ${formatDate(generatedAt, money.locale)} by ${context.generatedBy} · ${outcome.label} predicted over each version's horizon · amounts in ${money.currency}`,
      left,
      50,
      { width: right - left, lineBreak: false, ellipsis: true },
    );

  let y = 68;
  const rule = (at: number) => doc.moveTo(left, at).lineTo(right, at).lineWidth(0.5).strokeColor(colors.rule).stroke();

  /** One table row: a label, and a text per column; returns the row's height. */
  const row = (label: string, cells: (column: ComparisonColumnDto) => string, options: { bold?: boolean; size?: number; color?: (column: ComparisonColumnDto) => string; maxLines?: number } = {}) => {
    const size = options.size ?? 8.5;
    const lineHeight = size * 1.25;
    const maxLines = options.maxLines ?? 1;
    const texts = columns.map(cells);
    doc.font(options.bold ? bold : regular).fontSize(size);
    const lines = Math.min(maxLines, Math.max(1, ...texts.map((text) => Math.ceil(doc.heightOfString(text, { width: inner }) / lineHeight))));
    const height = lines * lineHeight + 4;
    doc.font(regular).fontSize(8).fillColor(colors.muted).text(label, left, y + 2, { width: labelWidth - 8, height, ellipsis: true });
    texts.forEach((text, index) => {
      doc
        .font(options.bold ? bold : regular)
        .fontSize(size)
        .fillColor(options.color ? options.color(columns[index]) : colors.text)
        .text(text, columnX(index), y + 2, { width: inner, height: lines * lineHeight, ellipsis: true });
    });
    y += height;
    rule(y);
    return height;
  };

  // Column heads.
  columns.forEach((column, index) => {
    const x = columnX(index);
    doc.font(bold).fontSize(10).fillColor(colors.river).text(columnTitle(column), x, y, { width: inner, height: 13, ellipsis: true });
    const tag = column.position === comparison.baselinePosition ? "Baseline · " : "";
    const later = column.latestVersion > column.version ? ` · latest is v${column.latestVersion}` : "";
    doc
      .font(regular)
      .fontSize(7.5)
      .fillColor(colors.muted)
      .text(`${tag}saved by ${column.savedByName ?? "—"}, ${formatDate(column.savedAt, money.locale)} · ${column.horizon} ${column.periodNoun}s${later}`, x, y + 14, {
        width: inner,
        height: 10,
        ellipsis: true,
      });
  });
  y += 27;
  rule(y);

  // Spend.
  for (const channel of comparison.channels) {
    row(`${channel.label} spend`, (column) => (column.allocation[channel.name] === undefined ? "—" : formatSpend(column.allocation[channel.name], money)));
  }
  row("Total spend", (column) => formatSpend(column.totalSpend, money), { bold: true });

  // Outcome: numbers and the drawing (pale band = prediction interval, darker band = confidence interval, tick = point).
  row(`Predicted ${outcome.label.toLowerCase()} (horizon total)`, (column) => formatOutcomeValue(column.outcome.mean, column.outcomeShape, money), { bold: true, size: 10 });
  row("Confidence interval (expected)", (column) => `${percentLevel(column.level)}: ${formatOutcomeValue(column.outcome.confidence[0], column.outcomeShape, money)} to ${formatOutcomeValue(column.outcome.confidence[1], column.outcomeShape, money)}`);
  row("Prediction interval (realised)", (column) => `${percentLevel(column.level)}: ${formatOutcomeValue(column.outcome.prediction[0], column.outcomeShape, money)} to ${formatOutcomeValue(column.outcome.prediction[1], column.outcomeShape, money)}`);

  const low = Math.min(...columns.map((column) => column.outcome.prediction[0]));
  const high = Math.max(...columns.map((column) => column.outcome.prediction[1]));
  const span = high - low || Math.abs(high) || 1;
  const domain: [number, number] = [low - span * 0.05, high + span * 0.05];
  const bandHeight = 16;
  doc.font(regular).fontSize(8).fillColor(colors.muted).text("On one scale:", left, y + 2, { width: labelWidth - 8 });
  doc.fontSize(6.5).text("pale band = prediction interval, dark band = confidence interval, tick = predicted total", left, y + 12, { width: labelWidth - 8, height: 24, ellipsis: true });
  columns.forEach((column, index) => {
    const x0 = columnX(index);
    const scale = (value: number) => x0 + ((value - domain[0]) / (domain[1] - domain[0])) * inner;
    const mid = y + 4 + bandHeight / 2;
    const warned = column.warnings.length > 0;
    const band = (interval: [number, number], thickness: number, color: string) =>
      doc.rect(scale(interval[0]), mid - thickness / 2, Math.max(1, scale(interval[1]) - scale(interval[0])), thickness).fill(color);
    band(column.outcome.prediction, bandHeight * 0.62, colors.pale);
    band(column.outcome.confidence, bandHeight * 0.34, warned ? "#e9a999" : colors.mid);
    doc.moveTo(scale(column.outcome.mean), mid - bandHeight * 0.36).lineTo(scale(column.outcome.mean), mid + bandHeight * 0.36).lineWidth(2).strokeColor(warned ? colors.ember : colors.river).stroke();
    doc.font(regular).fontSize(6.5).fillColor(colors.muted);
    doc.text(formatOutcomeValue(domain[0], column.outcomeShape, money), x0, mid + bandHeight / 2 + 1, { width: inner / 2, lineBreak: false });
    doc.text(formatOutcomeValue(domain[1], column.outcomeShape, money), x0 + inner / 2, mid + bandHeight / 2 + 1, { width: inner / 2, align: "right", lineBreak: false });
  });
  y += bandHeight + 18;
  rule(y);

  row(
    "Difference from the baseline (expected total)",
    (column) => {
      const difference = column.difference;
      if (difference.kind === "baseline") return "Baseline";
      if (difference.kind === "none") return "No joint interval: fits differ; each outcome stands alone";
      return `${formatOutcomeValue(difference.mean, column.outcomeShape, money, true)} (${percentLevel(difference.level)} CI ${formatOutcomeValue(difference.confidence[0], column.outcomeShape, money, true)} to ${formatOutcomeValue(difference.confidence[1], column.outcomeShape, money, true)})${difference.horizonsDiffer ? "; horizons differ" : ""}`;
    },
    { bold: true, maxLines: 2 },
  );
  row("Warnings", (column) => (column.warnings.length === 0 ? "None: inside the observed ranges" : column.warnings.map((warning) => warning.message).join(" ")), {
    size: 7,
    maxLines: 6,
    color: (column) => (column.warnings.length > 0 ? colors.ember : colors.text),
  });
  row("Fit", (column) => `${column.fit.name} (${column.fit.status.replace("_", " ")})`, { maxLines: 2 });
  row("Approved by", (column) => (column.fit.approvedByName ? `${column.fit.approvedByName}, ${formatDate(column.fit.approvedAt, money.locale)}` : "Not approved"));
  row("Sign-off", (column) => signoffSentence(column, money.locale), {
    bold: true,
    maxLines: 3,
    color: (column) => (column.signoff?.decision === "signed_off" ? colors.reed : column.signoff?.decision === "declined" ? colors.ember : colors.muted),
  });

  // Cautions, always printed, at the foot of the page.
  const cautionTop = Math.max(y + 10, bottom - 54);
  doc.font(bold).fontSize(8.5).fillColor(colors.river).text("Read these numbers with care", left, cautionTop, { width: right - left, lineBreak: false });
  doc.font(regular).fontSize(8).fillColor(colors.text);
  comparisonCautions.forEach((caution, index) => {
    doc.text(`• ${caution}`, left, cautionTop + 12 + index * 11, { width: right - left, lineBreak: false, ellipsis: true });
  });
  doc.end();
  return finished;
}
