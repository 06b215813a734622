/**
 * The one CSV writer: papaparse's, with RFC 4180 framing (a header row first, every record ending
 * in CRLF, a field quoted when it holds a comma, quote, CR or LF, its quotes doubled).
 *
 * `escapeFormulae` is for files people open in a spreadsheet (the parts catalogue): a cell that
 * starts with = + - @ tab or CR gets a leading apostrophe, so a spreadsheet shows it as text instead
 * of running it as a formula (the OWASP "CSV Injection" advice). `unguardCell` takes the apostrophe
 * off again on import, so an export re-imports exactly. Files for a titler or an edit system
 * (chapters, spec cards) are written as they are: an apostrophe would show on screen.
 */
import Papa from 'papaparse';

const FORMULA_START = /^[=+\-@\t\r]/;

export function csvText(records: string[][], options: { escapeFormulae?: boolean } = {}): string {
	if (records.length === 0) return '';
	return `${Papa.unparse(records, { newline: '\r\n', escapeFormulae: options.escapeFormulae ?? false })}\r\n`;
}

/** Undoes `escapeFormulae` for one cell: `'=SUM(A1)` reads back as `=SUM(A1)`; other cells are unchanged. */
export function unguardCell(cell: string): string {
	return cell.startsWith("'") && FORMULA_START.test(cell.slice(1)) ? cell.slice(1) : cell;
}
