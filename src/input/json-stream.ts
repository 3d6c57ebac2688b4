// One JSON text read piece by piece: bytes go to a streaming tokenizer (@streamparser/json) and the
// tokens are checked against the JSON grammar and built into values here, without recursion, so a
// file is never held as one string and a hostile nesting costs a list entry per level, not a stack
// frame. The members of one chosen list (a FeatureCollection's `features`) are handed out one at a
// time instead of being kept; everything else becomes the value JSON.parse would give.
import { Tokenizer, TokenizerError, TokenType } from '@streamparser/json';

export interface DuplicateKey {
  key: string;
  /** Where the object that holds it twice sits: keys and list indices from the top. */
  path: (string | number)[];
}

export interface JsonStreamOptions {
  /** Called with each member of a list directly under this key of the top object, instead of keeping it. */
  streamKey?: string;
  onMember?: (value: unknown, index: number) => void;
  /** Deepest nesting accepted; deeper is a syntax-level refusal (a hostile file). */
  maxDepth?: number;
}

/** A JSON text that breaks the grammar or nests beyond the bound; the message says where. */
export class JsonStreamError extends Error {}

// a GIS never writes this deep; a hostile file could, and each level is kept until it closes
export const MAX_JSON_DEPTH = 1_000_000;

// what the grammar allows next
const Expect = { Value: 0, ValueOrEnd: 1, Key: 2, KeyOrEnd: 3, Colon: 4, CommaOrEnd: 5, Done: 6 } as const;
type Expect = (typeof Expect)[keyof typeof Expect];

interface Frame {
  /** null while the values inside are handed out or dropped rather than kept. */
  container: unknown[] | Record<string, unknown> | null;
  isArray: boolean;
  /** The key whose value comes next (objects), or how many members came before (lists). */
  key: string;
  index: number;
  keys: Set<string> | null;
  /** Hands each member to the caller (the streamed list). */
  streamed: boolean;
}

export class JsonStream {
  private readonly tokenizer = new Tokenizer();
  private readonly stack: Frame[] = [];
  private expect: Expect = Expect.Value;
  private root: unknown = undefined;
  private seen = false;
  private deepest = 0;
  /** The first key an object held twice, in the order of the text (JSON.parse keeps the last, silently). */
  duplicate: DuplicateKey | null = null;
  /** How many members of the streamed list were handed out. */
  streamedCount = 0;
  /** Whether the last value under the streamed key was a list (as JSON.parse keeps the last). */
  streamedIsList = false;

  constructor(private readonly options: JsonStreamOptions = {}) {
    this.tokenizer.onToken = ({ token, value }) => this.take(token, value);
    // the tokenizer hands on whatever a token's handling threw: only its own errors are syntax errors
    this.tokenizer.onError = (error) => {
      if (error instanceof JsonStreamError || !(error instanceof TokenizerError)) throw error;
      throw new JsonStreamError(error.message);
    };
  }

  write(bytes: Uint8Array): void {
    this.tokenizer.write(bytes);
  }

  /** The whole value (its streamed list left empty), or undefined when the text held only white space. */
  end(): unknown {
    this.tokenizer.end();
    if (this.stack.length > 0) throw new JsonStreamError(`the text ends inside ${this.stack.length} open list(s) or object(s)`);
    return this.seen ? this.root : undefined;
  }

  /** How deep lists and objects nested. */
  get depth(): number {
    return this.deepest;
  }

  private take(token: TokenType, value: unknown): void {
    switch (token) {
      case TokenType.LEFT_BRACE:
      case TokenType.LEFT_BRACKET:
        this.open(token === TokenType.LEFT_BRACKET);
        return;
      case TokenType.RIGHT_BRACE:
      case TokenType.RIGHT_BRACKET:
        this.close(token === TokenType.RIGHT_BRACKET);
        return;
      case TokenType.COLON:
        if (this.expect !== Expect.Colon) this.unexpected('":"');
        this.expect = Expect.Value;
        return;
      case TokenType.COMMA:
        if (this.expect !== Expect.CommaOrEnd) this.unexpected('","');
        this.expect = this.stack[this.stack.length - 1].isArray ? Expect.Value : Expect.Key;
        return;
      case TokenType.STRING:
        if (this.expect === Expect.Key || this.expect === Expect.KeyOrEnd) {
          this.key(value as string);
          return;
        }
        this.value(value);
        return;
      case TokenType.NUMBER:
      case TokenType.TRUE:
      case TokenType.FALSE:
      case TokenType.NULL:
        this.value(value);
        return;
      default:
        this.unexpected(`token ${String(token)}`);
    }
  }

  private unexpected(what: string): never {
    const wanted = ['a value', 'a value or "]"', 'a key', 'a key or "}"', '":"', '"," or the end of a list or object', 'the end of the text'][this.expect];
    throw new JsonStreamError(`unexpected ${what} where ${wanted} should stand, at depth ${this.stack.length}`);
  }

  private key(key: string): void {
    const frame = this.stack[this.stack.length - 1];
    if (frame.keys) {
      if (frame.keys.has(key)) {
        if (!this.duplicate) this.duplicate = { key, path: this.pathTo(this.stack.length - 1) };
      } else frame.keys.add(key);
    }
    frame.key = key;
    this.expect = Expect.Colon;
  }

  /** The keys and indices from the top to the frame at a depth. */
  private pathTo(depth: number): (string | number)[] {
    const path: (string | number)[] = [];
    for (let i = 0; i < depth; i++) {
      const frame = this.stack[i];
      path.push(frame.isArray ? (frame.streamed ? this.streamedCount : frame.index) : frame.key);
    }
    return path;
  }

  private open(isArray: boolean): void {
    if (this.expect !== Expect.Value && this.expect !== Expect.ValueOrEnd) this.unexpected(isArray ? '"["' : '"{"');
    const depth = this.stack.length;
    if (depth + 1 > this.deepest) {
      this.deepest = depth + 1;
      if (this.deepest > (this.options.maxDepth ?? MAX_JSON_DEPTH)) throw new JsonStreamError(`lists and objects nest more than ${this.options.maxDepth ?? MAX_JSON_DEPTH} levels deep`);
    }
    const parent = depth > 0 ? this.stack[depth - 1] : null;
    // a top-level value that is not an object is refused whole: its contents are checked, never kept
    const dropped = depth === 0 ? isArray : parent!.container === null && !parent!.streamed;
    const streamed = isArray && depth === 1 && parent!.container !== null && !parent!.isArray && parent!.key === this.options.streamKey && this.options.onMember !== undefined;
    const container = dropped || streamed ? null : isArray ? [] : {};
    if (depth === 1 && !parent!.isArray && parent!.key === this.options.streamKey) {
      this.streamedIsList = isArray;
      // a second list under the same key replaces the first, as JSON.parse would
      if (streamed) this.streamedCount = 0;
    }
    this.stack.push({ container, isArray, key: '', index: 0, keys: isArray ? null : new Set(), streamed });
    this.expect = isArray ? Expect.ValueOrEnd : Expect.KeyOrEnd;
  }

  private close(isArray: boolean): void {
    const frame = this.stack[this.stack.length - 1];
    if (!frame || frame.isArray !== isArray || (this.expect !== Expect.CommaOrEnd && this.expect !== (isArray ? Expect.ValueOrEnd : Expect.KeyOrEnd))) this.unexpected(isArray ? '"]"' : '"}"');
    this.stack.pop();
    // a list grown member by member keeps spare room (17 places for a position's 2); a copy is exact,
    // and keeps a list of numbers unboxed as JSON.parse does
    const value = frame.streamed ? [] : isArray && frame.container !== null ? exactCopy(frame.container as unknown[]) : frame.container;
    this.value(value, true);
  }

  private value(value: unknown, closing = false): void {
    if (!closing && this.expect !== Expect.Value && this.expect !== Expect.ValueOrEnd) this.unexpected(typeof value === 'string' ? 'text' : String(value));
    const depth = this.stack.length;
    if (depth === 0) {
      this.root = value;
      this.seen = true;
      this.expect = Expect.Done;
      return;
    }
    const frame = this.stack[depth - 1];
    if (frame.streamed) this.options.onMember!(value, this.streamedCount++);
    else if (frame.container === null) frame.index++;
    else if (frame.isArray) (frame.container as unknown[]).push(value), frame.index++;
    else if (frame.key === '__proto__') Object.defineProperty(frame.container, '__proto__', { value, writable: true, enumerable: true, configurable: true });
    else (frame.container as Record<string, unknown>)[frame.key] = value;
    this.expect = Expect.CommaOrEnd;
  }
}

/**
 * A list's exact copy. A position (two numbers) is built from a literal of its own, which V8 tracks
 * by where it is made: seeing nearly all of them kept, it makes them in the old generation at once
 * instead of copying each out of the young one (keeping the features of a 141 MiB file took 18 s,
 * 8 of them in the young generation's collections; now 7 s, 1 of them).
 */
function exactCopy(list: unknown[]): unknown[] {
  if (list.length === 2) {
    const [x, y] = list;
    if (typeof x === 'number' && typeof y === 'number') return [x, y];
  }
  return list.slice();
}
