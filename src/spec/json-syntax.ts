/**
 * Locates the first syntax error of a JSON text, with a plain description. Used only after
 * JSON.parse has failed, to give the line and column (JSON.parse reports neither the same way on
 * every Node version).
 */

/** The first syntax error: character offset and what was expected. */
export interface JsonSyntaxError {
  readonly offset: number;
  readonly message: string;
}

const MAX_DEPTH = 1000;

/** The first syntax error of `text` as JSON (RFC 8259), or null when it is valid. */
export function findJsonSyntaxError(text: string): JsonSyntaxError | null {
  return new JsonScanner(text).scan();
}

class Failure {
  constructor(readonly offset: number, readonly message: string) {}
}

/** Recursive-descent recogniser: checks the grammar, builds nothing. */
class JsonScanner {
  private i = 0;

  constructor(private readonly text: string) {}

  scan(): JsonSyntaxError | null {
    try {
      this.value(0);
      this.ws();
      if (this.i < this.text.length) this.fail(`unexpected ${this.found()} after the end of the data`);
      return null;
    } catch (err) {
      if (err instanceof Failure) return { offset: err.offset, message: err.message };
      throw err;
    }
  }

  private fail(message: string, at = this.i): never {
    throw new Failure(at, message);
  }

  private found(): string {
    if (this.i >= this.text.length) return 'end of file';
    const c = this.text[this.i];
    return c === '\n' || c === '\r' ? 'end of line' : `'${c}'`;
  }

  private ws(): void {
    while (this.i < this.text.length) {
      const c = this.text[this.i];
      if (c === ' ' || c === '\t' || c === '\n' || c === '\r') this.i++;
      else break;
    }
  }

  private value(depth: number): void {
    if (depth > MAX_DEPTH) this.fail(`nesting deeper than ${MAX_DEPTH} levels`);
    this.ws();
    const c = this.text[this.i];
    if (c === '{') return this.object(depth);
    if (c === '[') return this.array(depth);
    if (c === '"') return this.string();
    if (c === '-' || (c !== undefined && c >= '0' && c <= '9')) return this.number();
    for (const word of ['true', 'false', 'null']) {
      if (this.text.startsWith(word, this.i)) {
        this.i += word.length;
        return;
      }
    }
    if (c === "'") this.fail("text must be in double quotes, found '''");
    this.fail(`expected a value, found ${this.found()}`);
  }

  private object(depth: number): void {
    this.i++; // {
    this.ws();
    if (this.text[this.i] === '}') {
      this.i++;
      return;
    }
    for (;;) {
      this.ws();
      if (this.text[this.i] !== '"') this.fail(`expected a property name in double quotes, found ${this.found()}`);
      this.string();
      this.ws();
      if (this.text[this.i] !== ':') this.fail(`expected ':' after the property name, found ${this.found()}`);
      this.i++;
      this.value(depth + 1);
      this.ws();
      const c = this.text[this.i];
      if (c === '}') {
        this.i++;
        return;
      }
      if (c !== ',') this.fail(`expected ',' or '}' after a property value, found ${this.found()}`);
      const comma = this.i;
      this.i++;
      this.ws();
      if (this.text[this.i] === '}') this.fail("trailing comma before '}'", comma);
    }
  }

  private array(depth: number): void {
    this.i++; // [
    this.ws();
    if (this.text[this.i] === ']') {
      this.i++;
      return;
    }
    for (;;) {
      this.value(depth + 1);
      this.ws();
      const c = this.text[this.i];
      if (c === ']') {
        this.i++;
        return;
      }
      if (c !== ',') this.fail(`expected ',' or ']' after a list item, found ${this.found()}`);
      const comma = this.i;
      this.i++;
      this.ws();
      if (this.text[this.i] === ']') this.fail("trailing comma before ']'", comma);
    }
  }

  private string(): void {
    const start = this.i;
    this.i++; // opening quote
    while (this.i < this.text.length) {
      const c = this.text.charCodeAt(this.i);
      if (c === 0x22) {
        this.i++;
        return;
      }
      if (c < 0x20) this.fail(c === 10 || c === 13 ? 'line break inside a string (missing closing quote?)' : 'control character inside a string');
      if (c === 0x5c) {
        const e = this.text[this.i + 1];
        if (e === 'u') {
          if (!/^[0-9a-fA-F]{4}$/.test(this.text.slice(this.i + 2, this.i + 6))) this.fail('invalid \\u escape; expected 4 hex digits');
          this.i += 6;
          continue;
        }
        if (e === undefined || !'"\\/bfnrt'.includes(e)) this.fail(`invalid escape '\\${e ?? ''}' in a string`);
        this.i += 2;
        continue;
      }
      this.i++;
    }
    this.fail('unterminated string (missing closing quote)', start);
  }

  private number(): void {
    const m = /^-?(0|[1-9][0-9]*)(\.[0-9]+)?([eE][+-]?[0-9]+)?/.exec(this.text.slice(this.i, this.i + 400));
    if (m === null || m[0] === '-') this.fail(`invalid number, found ${this.found()}`);
    this.i += m[0].length;
    const next = this.text[this.i];
    if (next !== undefined && /[0-9.eE+\-a-zA-Z_]/.test(next)) this.fail(`invalid number, found ${this.found()}`);
  }
}
