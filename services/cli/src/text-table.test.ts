import { describe, expect, it } from 'vitest';
import { alignColumns } from './text-table.js';

describe('alignColumns', () => {
  it('pads each column to its widest cell, right-aligns the columns asked for, and trims line ends', () => {
    const rows = [['shaft', 'rpm', 'via'], ['motor', '1480.00', ''], ['input', '1054.94', 'v-belt']];
    expect(alignColumns(rows, new Set([1]))).toEqual(['shaft      rpm  via', 'motor  1480.00', 'input  1054.94  v-belt']);
  });
});
