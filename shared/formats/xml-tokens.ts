/**
 * A small, non-validating XML tokenizer: enough for CML files, with line numbers for messages.
 * It yields start tags (with attributes), end tags and text; comments, processing instructions
 * and the DOCTYPE are skipped, CDATA becomes text. Namespace prefixes are kept in `name`
 * (callers compare the local part). No entity expansion beyond the five predefined entities and
 * numeric character references, so "billion laughs" documents cannot blow up.
 */

export type XmlToken =
  | { kind: 'open'; name: string; attrs: Record<string, string>; selfClosing: boolean; line: number }
  | { kind: 'close'; name: string; line: number }
  | { kind: 'text'; text: string; line: number };

/** A malformed document; `line` is 1-based. */
export class XmlSyntaxError extends Error {
  constructor(
    readonly line: number,
    message: string,
  ) {
    super(message);
  }
}

const ENTITIES: Record<string, string> = { lt: '<', gt: '>', amp: '&', quot: '"', apos: "'" };

/** Expand the predefined entities and numeric character references. */
export function decodeEntities(s: string): string {
  if (!s.includes('&')) return s;
  return s.replace(/&(#x[0-9a-fA-F]+|#\d+|[a-zA-Z]+);/g, (all, e: string) => {
    if (e[0] === '#') {
      const code = e[1] === 'x' ? parseInt(e.slice(2), 16) : parseInt(e.slice(1), 10);
      return code > 0 && code <= 0x10ffff ? String.fromCodePoint(code) : all;
    }
    return ENTITIES[e] ?? all;
  });
}

/** The local part of a possibly prefixed name (`cml:atom` → `atom`). */
export function localName(name: string): string {
  const i = name.indexOf(':');
  return i === -1 ? name : name.slice(i + 1);
}

const NAME = /[A-Za-z_][\w.\-:]*/y;
const ATTR = /\s*([A-Za-z_][\w.\-:]*)\s*=\s*("[^"]*"|'[^']*')/y;

/** Tokenize an XML text. @throws XmlSyntaxError at the first malformed construct. */
export function* xmlTokens(text: string): Generator<XmlToken> {
  let pos = 0;
  let line = 1;
  const advance = (to: number) => {
    for (let i = pos; i < to; i++) if (text.charCodeAt(i) === 10) line++;
    pos = to;
  };
  const until = (marker: string, what: string) => {
    const end = text.indexOf(marker, pos);
    if (end === -1) throw new XmlSyntaxError(line, `unterminated ${what}`);
    return end;
  };
  while (pos < text.length) {
    const lt = text.indexOf('<', pos);
    if (lt === -1) {
      const rest = text.slice(pos);
      if (rest.trim() !== '') yield { kind: 'text', text: decodeEntities(rest), line };
      advance(text.length);
      break;
    }
    if (lt > pos) {
      const chunk = text.slice(pos, lt);
      const startLine = line;
      advance(lt);
      if (chunk.trim() !== '') yield { kind: 'text', text: decodeEntities(chunk), line: startLine };
    }
    if (text.startsWith('<!--', pos)) {
      advance(until('-->', 'comment') + 3);
    } else if (text.startsWith('<![CDATA[', pos)) {
      const end = until(']]>', 'CDATA section');
      const startLine = line;
      const body = text.slice(pos + 9, end);
      advance(end + 3);
      yield { kind: 'text', text: body, line: startLine };
    } else if (text.startsWith('<?', pos)) {
      advance(until('?>', 'processing instruction') + 2);
    } else if (text.startsWith('<!', pos)) {
      // DOCTYPE (internal subsets with nested brackets are rare in CML; refuse them plainly).
      const end = until('>', 'declaration');
      if (text.slice(pos, end).includes('[')) throw new XmlSyntaxError(line, 'DOCTYPE internal subsets are not supported');
      advance(end + 1);
    } else if (text.startsWith('</', pos)) {
      NAME.lastIndex = pos + 2;
      const m = NAME.exec(text);
      if (!m) throw new XmlSyntaxError(line, 'malformed end tag');
      const startLine = line;
      const end = until('>', 'end tag');
      if (text.slice(NAME.lastIndex, end).trim() !== '') throw new XmlSyntaxError(line, `malformed end tag </${m[0]}>`);
      advance(end + 1);
      yield { kind: 'close', name: m[0], line: startLine };
    } else {
      NAME.lastIndex = pos + 1;
      const m = NAME.exec(text);
      if (!m) throw new XmlSyntaxError(line, "a '<' that does not start a tag");
      const startLine = line;
      const attrs: Record<string, string> = {};
      let p = NAME.lastIndex;
      for (;;) {
        ATTR.lastIndex = p;
        const a = ATTR.exec(text);
        if (!a) break;
        attrs[a[1]] = decodeEntities(a[2].slice(1, -1));
        p = ATTR.lastIndex;
      }
      const rest = /\s*(\/?)>/y;
      rest.lastIndex = p;
      const end = rest.exec(text);
      if (!end) throw new XmlSyntaxError(startLine, `malformed start tag <${m[0]}>`);
      advance(rest.lastIndex);
      yield { kind: 'open', name: m[0], attrs, selfClosing: end[1] === '/', line: startLine };
    }
  }
}
