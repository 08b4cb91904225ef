const POWERS_OF_TEN = [1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];

const CODE_0 = 48;
const CODE_9 = 57;
const CODE_SPACE = 32;
const CODE_TAB = 9;
const CODE_PLUS = 43;
const CODE_MINUS = 45;
const CODE_DOT = 46;
const CODE_COMMA = 44;

function isBlank(code: number): boolean {
  return code === CODE_SPACE || code === CODE_TAB || code === 160 || code === 13;
}

/**
 * Parses a decimal number in text[start, end) with the given decimal mark (char code of "." or ",").
 * Returns NaN for anything that is not a plain number. Exact: an integer mantissa below 2^53
 * divided by an exact power of ten rounds correctly, like parseFloat.
 */
export function parseDecimal(text: string, start: number, end: number, decimalCode: number): number {
  while (start < end && isBlank(text.charCodeAt(start))) start++;
  while (end > start && isBlank(text.charCodeAt(end - 1))) end--;
  if (start >= end) return NaN;
  let i = start;
  let negative = false;
  let code = text.charCodeAt(i);
  if (code === CODE_MINUS || code === 0x2212) {
    negative = true;
    i++;
  } else if (code === CODE_PLUS) {
    i++;
  }
  let mantissa = 0;
  let digits = 0;
  let fractionDigits = 0;
  let seenDecimal = false;
  for (; i < end; i++) {
    code = text.charCodeAt(i);
    if (code >= CODE_0 && code <= CODE_9) {
      mantissa = mantissa * 10 + (code - CODE_0);
      digits++;
      if (seenDecimal) fractionDigits++;
    } else if (code === decimalCode && !seenDecimal) {
      seenDecimal = true;
    } else {
      break;
    }
  }
  if (digits === 0) return NaN;
  if (i < end) {
    // Exponent or something unusual: hand the cell to the general parser.
    if (code === 101 || code === 69) return slowParse(text, start, end, decimalCode);
    return NaN;
  }
  if (digits > 15 || fractionDigits > 22) return slowParse(text, start, end, decimalCode);
  const value = fractionDigits === 0 ? mantissa : mantissa / POWERS_OF_TEN[fractionDigits];
  return negative ? -value : value;
}

function slowParse(text: string, start: number, end: number, decimalCode: number): number {
  let cell = text.slice(start, end).replace(/\u2212/g, "-");
  if (decimalCode === CODE_COMMA) {
    if (cell.includes(".")) return NaN;
    cell = cell.replace(",", ".");
  } else if (cell.includes(",")) {
    return NaN;
  }
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(cell)) return NaN;
  return Number(cell);
}

export const DECIMAL_CODES = { ".": CODE_DOT, ",": CODE_COMMA } as const;

const NUMBER_WITH_DOT = /^\s*[+-\u2212]?\d+(\.\d+)?([eE][+-]?\d+)?\s*$/;
const NUMBER_WITH_COMMA = /^\s*[+-\u2212]?\d+(,\d+)?([eE][+-]?\d+)?\s*$/;

export function looksNumeric(cell: string): boolean {
  return NUMBER_WITH_DOT.test(cell) || NUMBER_WITH_COMMA.test(cell);
}

export function hasDecimalComma(cell: string): boolean {
  return /^\s*[+-\u2212]?\d+,\d+\s*$/.test(cell);
}

export function hasDecimalPoint(cell: string): boolean {
  return /^\s*[+-\u2212]?\d*\.\d+([eE][+-]?\d+)?\s*$/.test(cell);
}
