/**
 * What the page's worker answers when a file is bad: the problem it sends back has a stable
 * code, a message saying what and where, and a hint saying what to do. A file too large for the
 * page is refused on its size alone, before any of it is read. Driven through the same client the
 * page uses, over the in-page port.
 */
import { describe, expect, it } from 'vitest';
import { WorkbenchClient } from '../../src/worker/client.ts';
import { createInPagePort } from '../../src/worker/in-page-port.ts';
import { MAX_PAGE_FILE_BYTES, MAX_PAGE_WORKBOOK_BYTES, pageLimit, sizeText } from '../../src/worker/page-limits.ts';
import { WorkerProblem, type Problem } from '../../src/worker/protocol.ts';
import { fileLimitFromAddress, problemNotice } from '../../src/ui/state/useWorkbench.ts';
import { buildXlsx } from '../e2e/helpers/xlsx.ts';
import { concat, utf8 } from './helpers.ts';

function open(file: File, maxBytes?: number): Promise<unknown> {
  const client = new WorkbenchClient(createInPagePort());
  return client.call('open', { slot: 'work', source: { kind: 'file', file }, draft: true, ...(maxBytes === undefined ? {} : { maxBytes }) });
}

async function problemOf(file: File, maxBytes?: number): Promise<Problem> {
  try {
    await open(file, maxBytes);
  } catch (error) {
    if (error instanceof WorkerProblem) return error.problem;
    throw error;
  }
  throw new Error('expected the file to be refused');
}

/** A File that records whether anything read its contents. */
class WatchedFile extends File {
  reads = 0;
  override stream(): ReturnType<File['stream']> {
    this.reads++;
    return super.stream();
  }
  override arrayBuffer(): Promise<ArrayBuffer> {
    this.reads++;
    return super.arrayBuffer();
  }
}

describe('files the page refuses', () => {
  it('too large: refused before reading, with the size, the limit, why, and the command line to use instead', async () => {
    const file = new WatchedFile(['id,amount\n' + 'r1,10\n'.repeat(2000)], 'export 2024.csv');
    const problem = await problemOf(file, 4096);
    expect(file.reads).toBe(0);
    expect(problem).toEqual({
      code: 'too-large-for-page',
      message: '“export 2024.csv” is 12 KB; the page opens files up to 4.0 KB, because it holds the whole table in this tab\'s memory. Nothing was read.',
      hint:
        'Use the command line, which streams files of any size: levelwise draft "export 2024.csv" -o recipe.json proposes a recipe, ' +
        'and levelwise apply recipe.json "export 2024.csv" -o encoded.csv encodes the file.',
    });
  });

  it('the limit is 1 GB for text and 64 MB for workbooks; a test can lower it, never raise the workbook one past its own', () => {
    expect(MAX_PAGE_FILE_BYTES).toBe(2 ** 30);
    expect(MAX_PAGE_WORKBOOK_BYTES).toBe(64 * 2 ** 20);
    expect([pageLimit('text'), pageLimit('workbook')]).toEqual([2 ** 30, 64 * 2 ** 20]);
    expect([pageLimit('text', 5000), pageLimit('workbook', 5000)]).toEqual([5000, 5000]);
    expect(pageLimit('workbook', 2 ** 31)).toBe(64 * 2 ** 20);
    expect([sizeText(999), sizeText(1536), sizeText(2 ** 30), sizeText(3.5 * 2 ** 30)]).toEqual(['999 bytes', '1.5 KB', '1.0 GB', '3.5 GB']);
  });

  it('a workbook over its own limit says so and suggests saving the sheet as CSV', async () => {
    const xlsx = buildXlsx([{ name: 'Data', rows: [['a', 'b'], ['1', '2']] }]);
    const problem = await problemOf(new File([xlsx], 'book.xlsx'), 100);
    expect(problem.code).toBe('too-large-for-page');
    expect(problem.message).toContain('the page opens workbooks up to 100 bytes');
    expect(problem.hint).toContain('Or save the sheet as CSV and open that here.');
  });

  it('the page takes a lower limit from its address, for tests: ?max-file-mb=', () => {
    expect(fileLimitFromAddress('?max-file-mb=2')).toBe(2 * 2 ** 20);
    expect(fileLimitFromAddress('?max-file-mb=0.5')).toBe(2 ** 19);
    expect(fileLimitFromAddress('')).toBeUndefined();
    expect(fileLimitFromAddress('?max-file-mb=lots')).toBeUndefined();
    expect(fileLimitFromAddress('?max-file-mb=-1')).toBeUndefined();
  });

  it('a ZIP archive named .csv is not a text table and, here, no workbook either', async () => {
    const problem = await problemOf(new File([new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0x14, 0x00, 0x00, 0x00, 0x08, 0x00])], 'survey.csv'));
    expect(problem.code).toBe('not-text');
    expect(problem.message).toMatch(/^“survey\.csv” is not a text table: its first bytes say it is a ZIP archive, and it is not an XLSX workbook either \(.+\)\.$/);
    expect(problem.hint).toBe('If it holds CSV files, unpack it and open one of them; if it is a workbook, save it again as .xlsx.');
  });

  it('a PNG image named .csv says it is a picture', async () => {
    const png = concat(new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), new Uint8Array(64));
    expect(await problemOf(new File([png], 'chart.csv'))).toEqual({
      code: 'not-text',
      message: 'This is not a text table: it looks like a PNG image.',
      hint: 'Choose the CSV or text file that holds the table.',
    });
  });

  it('an empty file says it is empty, and the notice the page shows carries the hint', async () => {
    const problem = await problemOf(new File([], 'empty.csv'));
    expect(problemNotice(problem, 'Could not open empty.csv')).toEqual({
      tone: 'error',
      title: 'Could not open empty.csv',
      detail: 'The file is empty (0 bytes).',
      hint: 'Choose a file with a header row and data rows.',
    });
  });

  it('a problem with a place shows its line and column in the notice, digits grouped', () => {
    const notice = problemNotice({ code: 'x', message: 'Something is off.', line: 12, column: 3, hint: 'Fix it.' }, 'Title');
    expect(notice.detail).toBe('Something is off (line 12, column 3).');
    expect(problemNotice({ code: 'x', message: 'Off.', line: 250_001, hint: 'Fix it.' }).detail).toBe('Off (line 250,001).');
  });

  it('a good file opens after a bad one: the session is not left broken', async () => {
    const client = new WorkbenchClient(createInPagePort());
    await expect(client.call('open', { slot: 'work', source: { kind: 'file', file: new File([], 'empty.csv') }, draft: true })).rejects.toBeInstanceOf(WorkerProblem);
    const opened = await client.call('open', { slot: 'work', source: { kind: 'file', file: new File([utf8('a,b\n1,x\n2,y\n')], 'good.csv') }, draft: true });
    expect(opened.rowCount).toBe(2);
  });
});
