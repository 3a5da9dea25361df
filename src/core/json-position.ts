/**
 * Where a JSON text stops being JSON, as a line and column a person can find in a text editor.
 * `JSON.parse` says what is wrong but not reliably where: depending on the engine and the error
 * its message has a character offset, a line and column, or neither ("Unexpected end of JSON
 * input"). This scanner follows the grammar of RFC 8259 §2–7 and stops at the first character that
 * breaks it. It keeps its own stack, so deeply nested input cannot overflow the call stack.
 */

export interface TextPosition {
  /** 0-based offset in the text (its length when the text ends too early). */
  readonly offset: number;
  /** 1-based line; lines end at LF (a CR before it belongs to the same line break). */
  readonly line: number;
  /** 1-based column, in characters. */
  readonly column: number;
}

const WHITE_SPACE = new Set([0x20, 0x09, 0x0a, 0x0d]);
const NUMBER = /-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][+-]?\d+)?/y;
const SIMPLE_ESCAPES = '"\\/bfnrt';
const HEX4 = /^[0-9a-fA-F]{4}$/;

/** The position of the first character that breaks JSON's grammar; null when the text is valid JSON. */
export function jsonErrorPosition(text: string): TextPosition | null {
  const offset = firstErrorOffset(text);
  return offset === null ? null : positionOf(text, offset);
}

export function positionOf(text: string, offset: number): TextPosition {
  let line = 1;
  let lineStart = 0;
  for (let at = text.indexOf('\n'); at !== -1 && at < offset; at = text.indexOf('\n', at + 1)) {
    line++;
    lineStart = at + 1;
  }
  return { offset, line, column: offset - lineStart + 1 };
}

type Expecting = 'value' | 'key' | 'key-or-close' | 'after-value';

function firstErrorOffset(text: string): number | null {
  const open: ('{' | '[')[] = [];
  let i = 0;
  let expecting: Expecting = 'value';
  const skipWhiteSpace = (): void => {
    while (i < text.length && WHITE_SPACE.has(text.charCodeAt(i))) i++;
  };
  /** At a quote: moves past the string; false with `i` at the offending character. */
  const readString = (): boolean => {
    i++;
    while (i < text.length) {
      const c = text.charCodeAt(i);
      if (c === 0x22) {
        i++;
        return true;
      }
      if (c < 0x20) return false;
      if (c !== 0x5c) {
        i++;
        continue;
      }
      const escaped = text[i + 1];
      if (escaped !== undefined && SIMPLE_ESCAPES.includes(escaped)) i += 2;
      else if (escaped === 'u' && HEX4.test(text.slice(i + 2, i + 6))) i += 6;
      else return false;
    }
    return false;
  };
  const readScalar = (): boolean => {
    const c = text[i];
    if (c === '"') return readString();
    for (const literal of ['true', 'false', 'null']) {
      if (text.startsWith(literal, i)) {
        i += literal.length;
        return true;
      }
    }
    NUMBER.lastIndex = i;
    if (!NUMBER.test(text)) return false;
    i = NUMBER.lastIndex;
    return true;
  };

  for (;;) {
    skipWhiteSpace();
    const c = text[i];
    if (expecting === 'after-value') {
      const top = open.at(-1);
      if (top === undefined) return c === undefined ? null : i;
      if (c === ',') expecting = top === '{' ? 'key' : 'value';
      else if ((c === '}' && top === '{') || (c === ']' && top === '[')) open.pop();
      else return i;
      i++;
      continue;
    }
    if (c === undefined) return i;
    if (expecting === 'key' || expecting === 'key-or-close') {
      if (c === '}' && expecting === 'key-or-close') {
        open.pop();
        i++;
        expecting = 'after-value';
        continue;
      }
      if (c !== '"' || !readString()) return i;
      skipWhiteSpace();
      if (text[i] !== ':') return i;
      i++;
      expecting = 'value';
      continue;
    }
    if (c === '{' || c === '[') {
      open.push(c);
      i++;
      skipWhiteSpace();
      if (c === '[' && text[i] === ']') {
        open.pop();
        i++;
        expecting = 'after-value';
      } else expecting = c === '{' ? 'key-or-close' : 'value';
      continue;
    }
    if (!readScalar()) return i;
    expecting = 'after-value';
  }
}
