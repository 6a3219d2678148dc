/** What the uploaded bytes are, before any table reading. */
export type DecodedBytes =
  | { kind: "text"; text: string; encoding: "utf-8" | "utf-16le" | "utf-16be" | "windows-1252" }
  | { kind: "xlsx" }
  | { kind: "legacy-xls" }
  | { kind: "empty" }
  | { kind: "binary" };

/** Share of control characters (other than tab, CR, LF, FF) above which text is called binary (common practice). */
const BINARY_CONTROL_FRACTION = 0.02;

/**
 * Decide what the uploaded bytes are and decode text: xlsx (ZIP signature), legacy .xls (OLE2
 * signature), UTF-8 (with or without BOM), UTF-16 (with BOM), else Windows-1252. Text with NUL bytes
 * or many control characters is called binary. Never throws.
 */
export function decodeBytes(bytes: Uint8Array): DecodedBytes {
  if (bytes.length === 0) return { kind: "empty" };
  if (bytes.length >= 4 && bytes[0] === 0x50 && bytes[1] === 0x4b && bytes[2] === 0x03 && bytes[3] === 0x04)
    return { kind: "xlsx" };
  if (bytes.length >= 4 && bytes[0] === 0xd0 && bytes[1] === 0xcf && bytes[2] === 0x11 && bytes[3] === 0xe0)
    return { kind: "legacy-xls" };
  let text: string;
  let encoding: "utf-8" | "utf-16le" | "utf-16be" | "windows-1252";
  if (bytes.length >= 2 && bytes[0] === 0xff && bytes[1] === 0xfe) {
    encoding = "utf-16le";
    text = new TextDecoder("utf-16le").decode(bytes.subarray(2));
  } else if (bytes.length >= 2 && bytes[0] === 0xfe && bytes[1] === 0xff) {
    encoding = "utf-16be";
    text = new TextDecoder("utf-16be").decode(bytes.subarray(2));
  } else {
    try {
      text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
      encoding = "utf-8";
    } catch {
      text = new TextDecoder("windows-1252").decode(bytes);
      encoding = "windows-1252";
    }
  }
  text = text.replace(/^\uFEFF/, "");
  const sample = text.length > 8192 ? text.slice(0, 8192) : text;
  let control = 0;
  for (let i = 0; i < sample.length; i++) {
    const c = sample.charCodeAt(i);
    if (c === 0) return { kind: "binary" };
    if (c < 32 && c !== 9 && c !== 10 && c !== 13 && c !== 12) control++;
    else if (c === 0xfffd) control++;
  }
  if (sample.length > 0 && control / sample.length > BINARY_CONTROL_FRACTION) return { kind: "binary" };
  if (text.trim().length === 0) return { kind: "empty" };
  return { kind: "text", text, encoding };
}
