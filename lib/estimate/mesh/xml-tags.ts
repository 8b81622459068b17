import { bytesEqualAscii, isWhitespace } from "./byte-text";

const LT = 0x3c;
const GT = 0x3e;
const SLASH = 0x2f;
const QUESTION = 0x3f;
const BANG = 0x21;
const EQUALS = 0x3d;
const COLON = 0x3a;
const DOUBLE_QUOTE = 0x22;
const SINGLE_QUOTE = 0x27;
const MAX_ATTRIBUTES = 64;

export type XmlTagKind = "start" | "end";

/**
 * A forward-only reader of the tags in UTF-8 XML held as bytes. It reports element names
 * and attribute positions without building strings or objects, which keeps a 3MF model of a
 * million triangles fast to read. Text content, comments, CDATA, processing instructions and
 * doctype are skipped; namespace prefixes are dropped from names (core 3MF elements are
 * matched by local name).
 */
export class XmlTagReader {
  kind: XmlTagKind = "start";
  selfClosing = false;
  private nameStart = 0;
  private nameEnd = 0;
  private position = 0;
  private attributeCount = 0;
  // name start, name end, value start, value end — per attribute
  private readonly attributes = new Int32Array(MAX_ATTRIBUTES * 4);

  constructor(readonly bytes: Uint8Array) {}

  /** Advances to the next start or end tag; false at the end of the document. */
  next(): boolean {
    const { bytes } = this;
    for (;;) {
      const open = bytes.indexOf(LT, this.position);
      if (open < 0) return false;
      const marker = bytes[open + 1];
      if (marker === QUESTION) this.position = this.skipPast(open, "?>");
      else if (marker === BANG) this.position = this.skipMarkup(open);
      else if (marker === SLASH) return this.readEndTag(open + 2);
      else return this.readStartTag(open + 1);
    }
  }

  nameIs(localName: string): boolean {
    return bytesEqualAscii(this.bytes, this.nameStart, this.nameEnd, localName);
  }

  /** Index of the attribute with this local name, or −1. */
  findAttribute(localName: string): number {
    for (let a = 0; a < this.attributeCount; a++) {
      if (bytesEqualAscii(this.bytes, this.attributes[4 * a]!, this.attributes[4 * a + 1]!, localName)) return a;
    }
    return -1;
  }

  valueStart(attribute: number): number {
    return this.attributes[4 * attribute + 2]!;
  }

  valueEnd(attribute: number): number {
    return this.attributes[4 * attribute + 3]!;
  }

  valueText(attribute: number): string {
    return decodeEntities(new TextDecoder().decode(this.bytes.subarray(this.valueStart(attribute), this.valueEnd(attribute))));
  }

  private readEndTag(start: number): boolean {
    this.kind = "end";
    this.selfClosing = false;
    this.attributeCount = 0;
    this.readName(start);
    const close = this.bytes.indexOf(GT, this.nameEnd);
    this.position = close < 0 ? this.bytes.length : close + 1;
    return true;
  }

  private readStartTag(start: number): boolean {
    const { bytes } = this;
    this.kind = "start";
    this.selfClosing = false;
    this.attributeCount = 0;
    let i = this.readName(start);
    for (;;) {
      while (i < bytes.length && isWhitespace(bytes[i]!)) i++;
      const byte = bytes[i];
      if (byte === undefined) {
        this.position = i;
        return true;
      }
      if (byte === GT) break;
      if (byte === SLASH && bytes[i + 1] === GT) {
        this.selfClosing = true;
        i++;
        break;
      }
      i = this.readAttribute(i);
    }
    this.position = i + 1;
    return true;
  }

  private readName(start: number): number {
    const { bytes } = this;
    let i = start;
    let localStart = start;
    while (i < bytes.length) {
      const byte = bytes[i]!;
      if (isWhitespace(byte) || byte === GT || byte === SLASH) break;
      if (byte === COLON) localStart = i + 1;
      i++;
    }
    this.nameStart = localStart;
    this.nameEnd = i;
    return i;
  }

  private readAttribute(start: number): number {
    const { bytes } = this;
    let i = start;
    let localStart = start;
    while (i < bytes.length && bytes[i] !== EQUALS && bytes[i] !== GT && !isWhitespace(bytes[i]!)) {
      if (bytes[i] === COLON) localStart = i + 1;
      i++;
    }
    const nameEnd = i;
    while (i < bytes.length && isWhitespace(bytes[i]!)) i++;
    if (bytes[i] !== EQUALS) return Math.max(i, start + 1); // attribute without a value: ignore it
    i++;
    while (i < bytes.length && isWhitespace(bytes[i]!)) i++;
    const quote = bytes[i];
    if (quote !== DOUBLE_QUOTE && quote !== SINGLE_QUOTE) return i;
    const valueStart = i + 1;
    let valueEnd = bytes.indexOf(quote, valueStart);
    if (valueEnd < 0) valueEnd = bytes.length;
    if (this.attributeCount < MAX_ATTRIBUTES) {
      const slot = 4 * this.attributeCount++;
      this.attributes[slot] = localStart;
      this.attributes[slot + 1] = nameEnd;
      this.attributes[slot + 2] = valueStart;
      this.attributes[slot + 3] = valueEnd;
    }
    return valueEnd + 1;
  }

  private skipMarkup(open: number): number {
    if (this.startsWith(open, "<!--")) return this.skipPast(open, "-->");
    if (this.startsWith(open, "<![CDATA[")) return this.skipPast(open, "]]>");
    return this.skipPast(open, ">");
  }

  private startsWith(at: number, text: string): boolean {
    return bytesEqualAscii(this.bytes, at, Math.min(at + text.length, this.bytes.length), text);
  }

  private skipPast(from: number, terminator: string): number {
    const first = terminator.charCodeAt(0);
    let i = from;
    for (;;) {
      i = this.bytes.indexOf(first, i);
      if (i < 0) return this.bytes.length;
      if (this.startsWith(i, terminator)) return i + terminator.length;
      i++;
    }
  }
}

function decodeEntities(text: string): string {
  return text.replace(/&(lt|gt|amp|quot|apos|#x[0-9a-fA-F]+|#[0-9]+);/g, (_, entity: string) => {
    switch (entity) {
      case "lt":
        return "<";
      case "gt":
        return ">";
      case "amp":
        return "&";
      case "quot":
        return '"';
      case "apos":
        return "'";
      default:
        return String.fromCodePoint(
          entity.startsWith("#x") ? parseInt(entity.slice(2), 16) : parseInt(entity.slice(1), 10),
        );
    }
  });
}
