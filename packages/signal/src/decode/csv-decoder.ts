import type { Recording } from '../recording.js';
import { DecimalScanner } from './decimal-scanner.js';
import { decodeError } from './decode-error.js';
import { checkRecordingSize, resolveDecodeLimits, type DecodeLimits } from './decode-limits.js';
import { canonicalChannelUnit, checkChannelUnit, UNSTATED_UNIT } from '../units/channel-units.js';
import { decoderMetadataKeys, foldKey, isKnownMetadataKey, nearestMetadataKey } from './metadata-keys.js';
import { addWarning, channelNames, checkSampleRate, optionUnit } from './recording-parts.js';
import { inputBytes } from './text-input.js';

export interface CsvDecodeOptions {
  /** Cell separator; detected from the first line when absent (tab, else semicolon, else comma). */
  separator?: ',' | ';' | '\t';
  /** Whether the first line is a header; detected when absent (a header has no numeric cell). */
  header?: boolean;
  /** Time column by header name or 0-based index; `false` for none. Detected from header names when absent. */
  timeColumn?: string | number | false;
  /** Unit of the time column; by default taken from its header ('time_ms', 'time [ms]'), else seconds. */
  timeUnit?: 's' | 'ms' | 'us';
  /** Sample rate; overrides the time column and `# sampleRateHz=` comments. */
  sampleRateHz?: number;
  /** Unit of every data channel; overrides units in the header and in comments. */
  unit?: string;
  channelNames?: readonly string[];
  limits?: Partial<DecodeLimits>;
}

/** Relative part of the allowed deviation of one time step from the mean step. */
export const csvTimeStepTolerance = 0.005;

const LF = 10;
const CR = 13;
const SPACE = 32;
const TAB = 9;
const QUOTE = 34;
const HASH = 35;

const secondsPerTimeUnit: Record<string, number> = { s: 1, sec: 1, ms: 1e-3, us: 1e-6, 'µs': 1e-6 };
const timeNames: Array<[RegExp, number]> = [
  [/^(t|time|times|time_?s|time_?sec|seconds?|secs?|elapsed|elapsed_?s)$/i, 1],
  [/^(time_?ms|ms|milliseconds?)$/i, 1e-3],
  [/^(time_?us|us|µs|microseconds?)$/i, 1e-6],
];
const nonFiniteWord = /^[+-]?(nan|inf|infinity)$/i;

interface HeaderCell {
  name: string;
  unit?: string;
}

/** "accel [g]" or "accel (g)" gives name and unit. */
function headerCell(text: string): HeaderCell {
  const m = /^(.*?)\s*[[(]\s*([^\])]*?)\s*[\])]$/.exec(text);
  return m && m[1] !== '' ? { name: m[1], unit: m[2] || undefined } : { name: text };
}

function unquote(cell: string): string {
  const t = cell.trim();
  return t.length >= 2 && t.charCodeAt(0) === QUOTE && t.charCodeAt(t.length - 1) === QUOTE
    ? t.slice(1, -1).replace(/""/g, '"').trim()
    : t;
}

/** Splits one line into cells, keeping separators inside double quotes. */
function splitCells(line: string, separator: number): string[] {
  if (separator < 0) return [unquote(line)];
  const cells: string[] = [];
  let start = 0;
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const c = line.charCodeAt(i);
    if (c === QUOTE) quoted = !quoted;
    else if (c === separator && !quoted) {
      cells.push(unquote(line.slice(start, i)));
      start = i + 1;
    }
  }
  cells.push(unquote(line.slice(start)));
  return cells;
}

/** End of the line that starts at `pos`: the next LF or CR, or the end of the bytes. */
function lineEnd(bytes: Uint8Array, pos: number): number {
  const lf = bytes.indexOf(LF, pos);
  const end = lf < 0 ? bytes.length : lf;
  for (let i = pos; i < end; i++) if (bytes[i] === CR) return i;
  return end;
}

/** Position after the line break that starts at `end` (CRLF, LF or a lone CR). */
function afterBreak(bytes: Uint8Array, end: number): number {
  if (bytes[end] === CR) return bytes[end + 1] === LF ? end + 2 : end + 1;
  return end + 1;
}

const utf8 = new TextDecoder('utf-8');
const decodeSpan = (bytes: Uint8Array, start: number, end: number) => utf8.decode(bytes.subarray(start, end));

function isBlank(line: string): boolean {
  return line.trim() === '';
}

function detectSeparator(line: string): number {
  let tabs = 0;
  let semicolons = 0;
  let commas = 0;
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const c = line.charCodeAt(i);
    if (c === QUOTE) quoted = !quoted;
    else if (!quoted) {
      if (c === TAB) tabs++;
      else if (c === 59) semicolons++;
      else if (c === 44) commas++;
    }
  }
  // A semicolon or tab file may use commas inside cells (decimal commas, names); a comma file has neither.
  return tabs > 0 ? TAB : semicolons > 0 ? 59 : commas > 0 ? 44 : -1;
}

interface Comments {
  metadata: Record<string, string>;
  sampleRateHz?: { value: number; line: number };
  units?: { values: string[]; line: number };
  names?: string[];
  /** `# key=value` keys Kinespec does not read, with their line */
  unknownKeys: Array<{ key: string; line: number }>;
}

const isKey = (normal: string, key: keyof typeof decoderMetadataKeys) => decoderMetadataKeys[key].some((k) => foldKey(k) === normal);

function listValue(value: string): string[] {
  return value
    .split(/[,;\t]/)
    .map((s) => s.trim())
    .filter((s) => s !== '');
}

function readComment(body: string, line: number, comments: Comments): void {
  const eq = body.indexOf('=');
  if (eq <= 0) {
    const text = body.trim();
    if (text !== '') comments.metadata.comment = comments.metadata.comment ? `${comments.metadata.comment}\n${text}` : text;
    return;
  }
  const key = body.slice(0, eq).trim();
  const value = body.slice(eq + 1).trim();
  comments.metadata[key] = value;
  const normal = foldKey(key);
  if (isKey(normal, 'sampleRateHz')) {
    const rate = value === '' ? NaN : Number(value);
    checkSampleRate(rate, `The '# ${key}=' comment on line ${line}`, `line ${line}`);
    comments.sampleRateHz = { value: rate, line };
  } else if (isKey(normal, 'unit')) {
    comments.units = { values: listValue(value), line };
  } else if (isKey(normal, 'channels')) {
    comments.names = listValue(value);
  } else if (!isKnownMetadataKey(key)) {
    comments.unknownKeys.push({ key, line });
  }
}

/**
 * One warning per comment key that looks like a slip for a key Kinespec reads (`# unti=g` on line 3: did you
 * mean 'unit'?), and one listing the other keys, which are kept as metadata but change nothing.
 */
function warnUnknownKeys(comments: Comments, metadata: Record<string, string>): void {
  const free: string[] = [];
  for (const { key, line } of comments.unknownKeys) {
    const near = nearestMetadataKey(key);
    if (near) addWarning(metadata, `line ${line}: '# ${key}=' is not a key Kinespec reads (did you mean '${near}'?), kept as metadata only`);
    else free.push(key);
  }
  if (free.length) addWarning(metadata, `comment keys kept as metadata only, not read by Kinespec: ${free.join(', ')}`);
}

/**
 * Decodes delimited text: one numeric column per channel, an optional header row (names, and units in
 * brackets: `accel_x [g]`), an optional time column in s, ms or us (detected by name: t, time, time_s,
 * seconds, time_ms, ...) from which the sample rate is derived, and `# key=value` comment lines that
 * become metadata (`# sampleRateHz=25600`, `# unit=g`, `# channels=DE-H,DE-V`). Numbers use a decimal
 * point; the separator is a comma, semicolon or tab.
 *
 * Time steps may differ from the mean step by 0.5 % of it plus the resolution the two times were written
 * with (half a unit of each one's last digit); anything more is `csv_uneven_time`, naming the line. The
 * derived rate snaps to a whole number of hertz when that lies within the timing resolution.
 */
export function decodeCsv(input: string | Uint8Array, options: CsvDecodeOptions = {}): Recording {
  if (typeof input !== 'string' && !(input instanceof Uint8Array)) {
    throw decodeError('option_invalid', 'decodeCsv expects the file as a string or a Uint8Array.');
  }
  const limits = resolveDecodeLimits(options.limits);
  // The rows are read as bytes: numbers are ASCII, and a 20 MB string would cost as much as parsing it.
  const bytes = inputBytes(input);
  const length = bytes.length;
  const unitOption = optionUnit(options.unit);
  const comments: Comments = { metadata: {}, unknownKeys: [] };

  // Leading comment and blank lines, then the first content line (header or data).
  let pos = 0;
  let line = 1;
  let first: string | undefined;
  let separator = -1;
  let separatorGiven = false;
  if (options.separator !== undefined) {
    if (options.separator !== ',' && options.separator !== ';' && options.separator !== '\t') {
      throw decodeError('option_invalid', `separator (${JSON.stringify(options.separator)}) must be ',', ';' or a tab.`);
    }
    separator = options.separator.charCodeAt(0);
    separatorGiven = true;
  }
  while (pos < length) {
    const end = lineEnd(bytes, pos);
    const content = decodeSpan(bytes, pos, end);
    const trimmed = content.trimStart();
    if (trimmed.charCodeAt(0) === HASH) {
      readComment(trimmed.slice(1), line, comments);
    } else if (/^sep=.$/.test(content.trim()) && first === undefined && !separatorGiven) {
      // Spreadsheet exports may name their separator on a first line of its own.
      separator = content.trim().charCodeAt(4);
      separatorGiven = true;
    } else if (!isBlank(content)) {
      first = content;
      break;
    }
    pos = afterBreak(bytes, end);
    line++;
  }
  if (first === undefined) {
    throw decodeError(
      'empty_input',
      line <= 1 || Object.keys(comments.metadata).length === 0 ? 'The CSV file is empty.' : 'The CSV file holds only comment lines and no data.',
    );
  }
  const firstLine = line;
  if (!separatorGiven) separator = detectSeparator(first);
  let firstCells = splitCells(first, separator);
  // A line that ends with a separator gives an empty last cell; tolerate it if the first line does it too.
  const trailingSeparator = firstCells.length > 1 && firstCells[firstCells.length - 1] === '';
  if (trailingSeparator) firstCells = firstCells.slice(0, -1);
  const columnCount = firstCells.length;
  const scanner = new DecimalScanner();
  const isNumber = (cell: string) => nonFiniteWord.test(cell) || fullNumber(scanner, cell);
  const header = options.header ?? firstCells.every((cell) => !isNumber(cell));
  const headerCells = header ? firstCells.map(headerCell) : undefined;
  let dataStart = pos;
  let dataLine = firstLine;
  if (header) {
    dataStart = afterBreak(bytes, lineEnd(bytes, pos));
    dataLine = firstLine + 1;
  }

  const timeColumn = resolveTimeColumn(options.timeColumn, headerCells, columnCount);
  if (timeColumn && options.timeUnit !== undefined) {
    const perUnit = secondsPerTimeUnit[options.timeUnit];
    if (perUnit === undefined) throw decodeError('option_invalid', `timeUnit (${String(options.timeUnit)}) must be 's', 'ms' or 'us'.`);
    timeColumn.secondsPerUnit = perUnit;
  }
  const dataColumns = columnCount - (timeColumn ? 1 : 0);
  checkRecordingSize(dataColumns, 0, limits, `line ${firstLine}`);

  // Upper bound on the rows: one per line break left. Buffers are sized once, before parsing.
  const rowBound = countLineBreaks(bytes, dataStart) + 1;
  const capacity = Math.min(
    rowBound,
    limits.maxSamplesPerChannel,
    Math.floor(limits.maxTotalSamples / Math.max(1, dataColumns)),
  );
  const columns = Array.from({ length: columnCount }, () => new Float64Array(capacity));
  const timeIndex = timeColumn ? timeColumn.index : -1;
  // Per row, the decimal exponent of the time cell's last digit: the resolution each time was written with.
  const timeDigitExponents = new Int16Array(timeColumn ? capacity : 0);

  const layout: RowLayout = {
    bytes,
    separator,
    trailingSeparator,
    columnCount,
    headerNames: headerCells?.map((h) => h.name),
    firstLine,
    header,
    scanner,
  };
  const row = readRows(layout, dataStart, dataLine, {
    columns,
    capacity,
    timeIndex,
    timeDigitExponents,
    comments,
    onCapacity: (l) => checkRecordingSize(dataColumns, capacity + 1, limits, `line ${l}`),
  });

  if (row === 0) {
    throw decodeError('no_samples', `The CSV file has ${header ? 'a header but ' : ''}no data lines.`, `line ${dataLine}`);
  }
  if (dataColumns === 0) {
    throw decodeError('no_samples', 'The CSV file has a time column but no data column.', `line ${firstLine}`);
  }
  checkRecordingSize(dataColumns, row, limits);

  const metadata: Record<string, string> = { ...comments.metadata };
  let timeRate: number | undefined;
  if (timeColumn) {
    timeRate = timeColumnRate(
      columns[timeColumn.index].subarray(0, row),
      timeDigitExponents,
      timeColumn,
      (r) => lineOfRow(bytes, dataStart, dataLine, r),
    );
    metadata.timeColumn = timeColumn.name;
  }
  const sampleRateHz = chooseSampleRate(options.sampleRateHz, timeRate, comments.sampleRateHz, metadata);

  const dataIndices = Array.from({ length: columnCount }, (_, i) => i).filter((i) => i !== timeIndex);
  const fileNames = headerCells ? dataIndices.map((i) => headerCells[i].name) : comments.names;
  if (!headerCells && comments.names && comments.names.length !== dataIndices.length) {
    addWarning(metadata, `the channels comment names ${comments.names.length} channels but the file has ${dataIndices.length}, so names ch1.. were used`);
  }
  const names = channelNames(dataIndices.length, options.channelNames, fileNames);
  const commentUnits = comments.units?.values;
  const units = dataIndices.map((i, k) => {
    const fromHeader = headerCells?.[i].unit;
    const fromComment =
      commentUnits?.length === 1 ? commentUnits[0] : commentUnits?.length === dataIndices.length ? commentUnits[k] : undefined;
    const fromFile = fromHeader ?? fromComment;
    if (unitOption === undefined) {
      if (fromFile === undefined) return UNSTATED_UNIT;
      const where = fromHeader !== undefined ? `line ${firstLine}` : `line ${comments.units!.line}`;
      return checkChannelUnit(fromFile, `column '${names[k]}'`, where);
    }
    if (fromFile !== undefined && canonicalChannelUnit(fromFile) !== unitOption) {
      addWarning(metadata, `column '${names[k]}' says unit '${fromFile}' but '${unitOption}' was used`);
    }
    return unitOption;
  });
  if (commentUnits && commentUnits.length !== 1 && commentUnits.length !== dataIndices.length) {
    addWarning(metadata, `the unit comment lists ${commentUnits.length} units for ${dataIndices.length} channels and was not applied`);
  }
  warnUnknownKeys(comments, metadata);
  metadata.sourceFormat = 'csv';
  return {
    sampleRateHz,
    channels: dataIndices.map((i, k) => ({
      name: names[k],
      unit: units[k],
      // A view wastes only the rows taken by comment and blank lines; a large waste is worth one copy.
      samples: capacity - row <= capacity / 16 ? columns[i].subarray(0, row) : columns[i].slice(0, row),
    })),
    metadata,
  };
}

/** LF count from `start` (CR count for old Mac files without LF); one plain loop beats an indexOf call per line. */
function countLineBreaks(bytes: Uint8Array, start: number): number {
  let lf = 0;
  for (let i = start; i < bytes.length; i++) lf += bytes[i] === LF ? 1 : 0;
  if (lf > 0) return lf;
  let cr = 0;
  for (let i = start; i < bytes.length; i++) cr += bytes[i] === CR ? 1 : 0;
  return cr;
}

/** What the row reader needs to know about the file, also used to word its errors. */
interface RowLayout {
  bytes: Uint8Array;
  separator: number;
  trailingSeparator: boolean;
  columnCount: number;
  headerNames: string[] | undefined;
  firstLine: number;
  header: boolean;
  scanner: DecimalScanner;
}

interface RowSink {
  columns: Float64Array[];
  capacity: number;
  timeIndex: number;
  timeDigitExponents: Int16Array;
  comments: Comments;
  /** Called when a row arrives past `capacity` (only a size limit makes capacity smaller than the rows). */
  onCapacity: (line: number) => void;
}

/**
 * The hot loop: reads every data row from `start` into `sink.columns` and returns the row count.
 * Everything it touches is a local or a parameter (no captured variables) so that the JIT keeps it in registers;
 * anything unusual (quotes, words, errors) goes to `slowCell` and the error helpers.
 */
function readRows(layout: RowLayout, start: number, startLine: number, sink: RowSink): number {
  const bytes = layout.bytes;
  const length = bytes.length;
  const separator = layout.separator;
  const skipTabs = separator !== TAB;
  const columnCount = layout.columnCount;
  const last = columnCount - 1;
  const trailingSeparator = layout.trailingSeparator;
  const scanner = layout.scanner;
  const columns = sink.columns;
  const capacity = sink.capacity;
  const timeIndex = sink.timeIndex;
  const timeDigitExponents = sink.timeDigitExponents;
  let row = 0;
  let pos = start;
  let line = startLine;
  while (pos < length) {
    const lineStart = pos;
    let c = bytes[pos];
    while (c === SPACE || (c === TAB && skipTabs)) c = bytes[++pos];
    if (c === HASH) {
      const end = lineEnd(bytes, pos);
      readComment(decodeSpan(bytes, pos + 1, end), line, sink.comments);
      pos = afterBreak(bytes, end);
      line++;
      continue;
    }
    if (c === LF || c === CR || pos >= length) {
      // Blank line.
      pos = afterBreak(bytes, pos);
      line++;
      continue;
    }
    if (row === capacity) sink.onCapacity(line);
    for (let col = 0; col < columnCount; col++) {
      while (c === SPACE || (c === TAB && skipTabs)) c = bytes[++pos];
      // Some exporters quote every cell: "1.25" is read here too, anything else quoted goes the slow way.
      const from = c === QUOTE ? pos + 1 : pos;
      let value = scanner.scan(bytes, from, length);
      let end = scanner.end;
      if (end !== from) {
        c = bytes[end];
        if (from !== pos) c = c === QUOTE ? bytes[++end] : ((end = from), -1);
        while (c === SPACE || (c === TAB && skipTabs)) c = bytes[++end];
      }
      if (end === from || !(c === separator || c === LF || c === CR || end >= length)) {
        end = slowCellEnd(layout, pos);
        value = slowCellValue(layout, pos, end, line, col, lineStart);
        c = bytes[end];
      }
      if (value - value !== 0) {
        throw decodeError(
          'non_finite_sample',
          `Line ${line}, column ${col + 1}${columnLabel(layout, col)} holds ${decodeSpan(bytes, pos, end).trim()}, which is out of the range of a double; a recording must hold finite numbers only.`,
          `line ${line}, column ${col + 1}`,
        );
      }
      if (col === timeIndex) timeDigitExponents[row] = scanner.lastDigitExponent;
      columns[col][row] = value;
      if (col < last) {
        if (c !== separator) columnCountError(layout, line, lineStart);
        pos = end + 1;
        c = bytes[pos];
      } else {
        if (c === separator) {
          let after = end + 1;
          let d = bytes[after];
          while (d === SPACE || (d === TAB && skipTabs)) d = bytes[++after];
          if (!trailingSeparator || !(d === LF || d === CR || after >= length)) columnCountError(layout, line, lineStart);
          end = after;
        }
        pos = end >= length ? length : afterBreak(bytes, end);
      }
    }
    row++;
    line++;
  }
  return row;
}

function columnLabel(layout: RowLayout, col: number): string {
  return layout.headerNames ? ` ('${layout.headerNames[col]}')` : '';
}

function columnCountError(layout: RowLayout, line: number, lineStart: number): never {
  const { bytes, separator, trailingSeparator, columnCount, firstLine, header } = layout;
  const found = splitCells(decodeSpan(bytes, lineStart, lineEnd(bytes, lineStart)), separator);
  const cells = trailingSeparator && found.length > 1 && found[found.length - 1] === '' ? found.length - 1 : found.length;
  throw decodeError(
    'csv_column_count',
    `Line ${line} has ${cells} cell${cells === 1 ? '' : 's'} but line ${firstLine}${header ? ' (the header)' : ''} has ${columnCount}; every line needs the same columns.`,
    `line ${line}`,
  );
}

/** End of the cell that starts at `start`, honouring double quotes. */
function slowCellEnd(layout: RowLayout, start: number): number {
  const { bytes, separator } = layout;
  let end = start;
  let quoted = false;
  for (; end < bytes.length; end++) {
    const c = bytes[end];
    if (c === QUOTE) quoted = !quoted;
    else if (!quoted && (c === separator || c === LF || c === CR)) break;
  }
  return end;
}

/** Slow path for a cell the fast path did not take: quotes, padding, words, bad characters. */
function slowCellValue(layout: RowLayout, start: number, end: number, line: number, col: number, lineStart: number): number {
  const { bytes, separator, columnCount, scanner } = layout;
  const where = `line ${line}, column ${col + 1}`;
  const cell = unquote(decodeSpan(bytes, start, end));
  if (cell === '') {
    const atLineEnd = end >= bytes.length || bytes[end] === LF || bytes[end] === CR;
    if (col === 0 && atLineEnd && columnCount > 1) columnCountError(layout, line, lineStart);
    throw decodeError(
      'csv_non_numeric',
      `Line ${line}, column ${col + 1}${columnLabel(layout, col)} is empty; every cell needs a number (a gap in the recording cannot be filled in).`,
      where,
    );
  }
  if (nonFiniteWord.test(cell)) {
    throw decodeError(
      'non_finite_sample',
      `Line ${line}, column ${col + 1}${columnLabel(layout, col)} holds '${cell}'; a recording must hold finite numbers only.`,
      where,
    );
  }
  if (fullNumber(scanner, cell)) return scanner.scan(asciiBytes(cell), 0, cell.length);
  const hint =
    separator !== 44 && /^[+-]?\d*,\d+([eE][+-]?\d+)?$/.test(cell)
      ? ' It looks like a decimal comma: write numbers with a decimal point (1.25, not 1,25).'
      : '';
  throw decodeError(
    'csv_non_numeric',
    `Line ${line}, column ${col + 1}${columnLabel(layout, col)} holds '${cell.length > 40 ? `${cell.slice(0, 40)}...` : cell}', which is not a number.${hint}`,
    where,
  );
}

/** True when the whole cell is one decimal number. */
function fullNumber(scanner: DecimalScanner, cell: string): boolean {
  if (cell === '') return false;
  const bytes = asciiBytes(cell);
  scanner.scan(bytes, 0, bytes.length);
  return scanner.end === bytes.length;
}

const encoder = new TextEncoder();
function asciiBytes(cell: string): Uint8Array {
  return encoder.encode(cell);
}

interface TimeColumn {
  index: number;
  name: string;
  secondsPerUnit: number;
}

function resolveTimeColumn(
  option: string | number | false | undefined,
  header: HeaderCell[] | undefined,
  columnCount: number,
): TimeColumn | undefined {
  if (option === false) return undefined;
  const scaleOf = (cell: HeaderCell | undefined, index: number): TimeColumn => {
    if (!cell) return { index, name: `column ${index + 1}`, secondsPerUnit: 1 };
    const byName = timeNames.find(([re]) => re.test(cell.name));
    if (cell.unit !== undefined) {
      const perUnit = secondsPerTimeUnit[cell.unit.toLowerCase()];
      if (perUnit === undefined) {
        throw decodeError(
          'csv_time_invalid',
          `The time column '${cell.name} [${cell.unit}]' has unit '${cell.unit}'; write times in s, ms or us.`,
          `column ${index + 1}`,
        );
      }
      return { index, name: cell.name, secondsPerUnit: perUnit };
    }
    return { index, name: cell.name, secondsPerUnit: byName ? byName[1] : 1 };
  };
  if (typeof option === 'number') {
    if (!Number.isInteger(option) || option < 0 || option >= columnCount) {
      throw decodeError('option_invalid', `timeColumn (${option}) must be a column index from 0 to ${columnCount - 1}.`);
    }
    return scaleOf(header?.[option], option);
  }
  if (typeof option === 'string') {
    if (!header) throw decodeError('option_invalid', `timeColumn '${option}' names a column, but the CSV file has no header row.`);
    const index = header.findIndex((h) => h.name === option);
    if (index < 0) {
      throw decodeError(
        'option_invalid',
        `timeColumn '${option}' is not in the header; the columns are ${header.map((h) => `'${h.name}'`).join(', ')}.`,
      );
    }
    return scaleOf(header[index], index);
  }
  if (option !== undefined) throw decodeError('option_invalid', 'timeColumn must be a header name, a column index or false.');
  if (!header) return undefined;
  const index = header.findIndex((h) => timeNames.some(([re]) => re.test(h.name)));
  return index < 0 ? undefined : scaleOf(header[index], index);
}

/** The line number of data row `row`, found again only when an error needs it. */
function lineOfRow(bytes: Uint8Array, start: number, firstLine: number, row: number): number {
  let pos = start;
  let line = firstLine;
  let seen = -1;
  while (pos < bytes.length) {
    const end = lineEnd(bytes, pos);
    let first = pos;
    while (first < end && (bytes[first] === SPACE || bytes[first] === TAB)) first++;
    if (first < end && bytes[first] !== HASH && ++seen === row) return line;
    pos = afterBreak(bytes, end);
    line++;
  }
  return line;
}

function timeColumnRate(
  time: Float64Array,
  digitExponents: Int16Array,
  column: TimeColumn,
  lineOf: (row: number) => number,
): number {
  const n = time.length;
  const k = column.secondsPerUnit;
  // A time written to resolution u is off by at most u/2, so a step between two of them by up to (u1 + u2)/2.
  const halfUnits = new Float64Array(801);
  for (let e = -400; e <= 400; e++) halfUnits[e + 400] = 0.5 * 10 ** e * k;
  const halfUnitS = (row: number) => halfUnits[digitExponents[row] + 400];
  if (n < 2) {
    throw decodeError('csv_time_invalid', `The time column '${column.name}' has ${n} row; two or more are needed to give a sample rate.`);
  }
  const spanS = (time[n - 1] - time[0]) * k;
  if (!(spanS > 0)) {
    throw decodeError(
      'csv_time_invalid',
      `The time column '${column.name}' does not increase from the first row to the last; times must increase line by line.`,
    );
  }
  const stepS = spanS / (n - 1);
  // Binary rounding of the parsed times adds a few ulps to the printed resolution.
  const largest = Math.max(Math.abs(time[0]), Math.abs(time[n - 1])) * k;
  const fixedToleranceS = csvTimeStepTolerance * stepS + 4 * Number.EPSILON * largest;
  // A gap skews the mean step, so every step may miss it: report the step that misses it most.
  let worstRatio = 0;
  let worst = -1;
  for (let i = 1; i < n; i++) {
    const deltaS = (time[i] - time[i - 1]) * k;
    if (!(deltaS > 0)) {
      const l = lineOf(i);
      throw decodeError(
        'csv_time_invalid',
        `Time does not increase at line ${l} (${time[i]} after ${time[i - 1]} in column '${column.name}'); times must increase line by line.`,
        `line ${l}`,
      );
    }
    const ratio = Math.abs(deltaS - stepS) / (fixedToleranceS + halfUnitS(i) + halfUnitS(i - 1));
    if (ratio > worstRatio) {
      worstRatio = ratio;
      worst = i;
    }
  }
  if (worstRatio > 1) {
    const l = lineOf(worst);
    const deltaS = (time[worst] - time[worst - 1]) * k;
    const toleranceS = fixedToleranceS + halfUnitS(worst) + halfUnitS(worst - 1);
    throw decodeError(
      'csv_uneven_time',
      `Time steps are uneven: line ${l} comes ${deltaS.toPrecision(6)} s after the line before it, where the mean step is ${stepS.toPrecision(6)} s (tolerance ±${toleranceS.toPrecision(3)} s). Dropped samples leave gaps like this; cut the file at the gap.`,
      `line ${l}`,
    );
  }
  const rateHz = (n - 1) / spanS;
  // Snap to a whole number of hertz when the printed time resolution cannot tell them apart.
  const whole = Math.round(rateHz);
  const uncertaintyHz = rateHz * ((halfUnitS(0) + halfUnitS(n - 1)) / spanS + 1e-9);
  return whole > 0 && Math.abs(rateHz - whole) <= uncertaintyHz ? whole : rateHz;
}

function chooseSampleRate(
  optionHz: number | undefined,
  timeHz: number | undefined,
  comment: { value: number; line: number } | undefined,
  metadata: Record<string, string>,
): number {
  const disagree = (a: number, b: number) => Math.abs(a - b) > 0.005 * Math.max(a, b);
  if (optionHz !== undefined) {
    checkSampleRate(optionHz, 'sampleRateHz');
    if (timeHz !== undefined && disagree(optionHz, timeHz)) {
      addWarning(metadata, `the time column gives ${timeHz.toPrecision(8)} Hz but sampleRateHz ${optionHz} was used`);
    }
    if (comment && disagree(optionHz, comment.value)) {
      addWarning(metadata, `the comment on line ${comment.line} gives ${comment.value} Hz but sampleRateHz ${optionHz} was used`);
    }
    return optionHz;
  }
  if (timeHz !== undefined) {
    if (comment && disagree(comment.value, timeHz)) {
      addWarning(metadata, `the comment on line ${comment.line} gives ${comment.value} Hz but the time column gives ${timeHz.toPrecision(8)} Hz, which was used`);
    }
    return timeHz;
  }
  if (comment) return comment.value;
  throw decodeError(
    'sample_rate_invalid',
    "The CSV file gives no sample rate: add a time column (e.g. 'time_s'), a '# sampleRateHz=25600' comment line, or pass the sample rate.",
  );
}
